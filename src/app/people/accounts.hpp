#pragma once
// Managing user accounts (an administrator's work, doc/people.md): adding users, granting and revoking roles,
// deactivating, unlocking, resetting a password (which forces a change at the next log-in, so that an
// administrator cannot sign as the user) and the lab's password and session rules. Every change is a record.
#include <optional>
#include <string>
#include <vector>

#include "app/people/roles.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/users.hpp"

namespace plumb::app {

struct NewUser {
  std::string login;               ///< a-z, 0-9, '.', '_', '-'; never reused
  std::string full_name;           ///< the printed name on records and signatures
  std::vector<std::string> roles;  ///< as typed
  std::string password;            ///< the first password: temporary, changed at the first log-in
};

/// The database's first administrator: only when it has no accounts yet (a new database, or one from before
/// user accounts). Its password is its own (no forced change). Returns the actor it writes as.
store::Actor add_first_administrator(store::Database& db, const NewUser& admin);
/// The parts of add_first_administrator, for a command that records more in the same transaction (init): the
/// checks and the actor the new administrator writes as (InputError when the database has accounts already, or for
/// a login, name or password the lab's rules refuse), then its records, written by `rec` of that actor.
store::Actor first_administrator(store::Database& db, const NewUser& admin);
void record_first_administrator(store::Database& db, store::Recorder& rec, const NewUser& admin);

store::UserRecord add_user(store::Database& db, const store::Actor& admin, const NewUser& user);
void grant_role(store::Database& db, const store::Actor& admin, const std::string& login, const std::string& role);
void revoke_role(store::Database& db, const store::Actor& admin, const std::string& login, const std::string& role,
                 const std::string& reason);
void deactivate_user(store::Database& db, const store::Actor& admin, const std::string& login,
                     const std::string& reason);
void reactivate_user(store::Database& db, const store::Actor& admin, const std::string& login,
                     const std::string& reason);
void unlock_user(store::Database& db, const store::Actor& admin, const std::string& login, const std::string& reason);
/// A temporary password the user must change at the next log-in.
void reset_password(store::Database& db, const store::Actor& admin, const std::string& login,
                    const std::string& temporary);
/// The user's own new password (after authenticating with the old one): it must differ from the old one.
void change_own_password(store::Database& db, const store::Actor& user, const std::string& new_password);

struct PolicyChange {
  std::optional<int> min_password_length, max_failed_logins, idle_minutes, password_max_age_days;
  bool no_password_ageing = false;
};
store::SecuritySettings set_policy(store::Database& db, const store::Actor& admin, const PolicyChange& change);

struct UserSummary {
  store::UserRecord user;
  std::vector<std::string> roles;
  bool active = true, locked = false, must_change = false;
};
std::vector<UserSummary> list_users(store::Database& db);

/// InputError naming `field` unless `password` is fit (the lab's minimum length, at most 1,024 bytes, no control
/// characters); the password itself is never shown.
void check_new_password(store::Database& db, const std::string& password, const std::string& field);

}  // namespace plumb::app
