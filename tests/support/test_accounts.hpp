#pragma once
// Accounts for unit tests that call the app layer directly: the app takes the authenticated actor, and a signature
// (approve, correct, void) needs an account, so the test makes the accounts the CLI would have authenticated.
#include <string>
#include <utility>
#include <vector>

#include "app/people/accounts.hpp"

namespace plumb::test {

class TestAccounts {
 public:
  /// Adds the first administrator of `db` (a database without accounts, its lab already recorded).
  explicit TestAccounts(store::Database& db)
      : db_(db), admin_(app::add_first_administrator(db, {"unit-admin", "Unit Administrator", {}, password})) {}

  /// A user with `roles` (as typed, e.g. "quality manager"); the actor its records are written as.
  store::Actor add(const std::string& login, const std::string& full_name, std::vector<std::string> roles) {
    const auto user = app::add_user(db_, admin_, {login, full_name, std::move(roles), password});
    return {full_name, login, user.id};
  }

  [[nodiscard]] const store::Actor& admin() const { return admin_; }

 private:
  static constexpr const char* password = "unit-test-password-long-enough";
  store::Database& db_;
  store::Actor admin_;
};

}  // namespace plumb::test
