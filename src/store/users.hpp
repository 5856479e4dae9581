#pragma once
// User accounts, their passwords, roles, account events, sessions and security settings (schema/011_users.sql):
// the rows and the look-ups. What they mean (who may do what, lock-out, expiry) is decided in app/people/.
#include <SQLiteCpp/Database.h>

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "store/recorder.hpp"

namespace plumb::store {

struct UserRecord {
  std::int64_t id = 0;
  std::string login;
  std::string full_name;
  std::string created_at;
};

struct PasswordRecord {
  std::int64_t id = 0;
  std::string hash;
  bool must_change = false;
  std::string set_at;
};

struct AccountEvent {
  std::int64_t id = 0;
  std::int64_t user_id = 0;
  std::string event;  ///< as in the schema: "role granted", "failed log-in", ...
  std::string role;   ///< role events only
  std::string reason;
  std::string at;
};

struct SecuritySettings {
  int min_password_length = 12;
  int max_failed_logins = 5;
  int idle_minutes = 15;
  std::optional<int> password_max_age_days;
  std::string password_hashing = "moderate";
  std::string set_at;  ///< empty: the defaults (no row yet)
};

struct SessionRecord {
  std::int64_t id = 0;
  std::int64_t user_id = 0;
  std::string opened_at;
  int idle_minutes = 0;
  std::optional<std::string> ended_at;
  std::string last_used_at;  ///< opened_at until the first use
  bool used = false;         ///< a use is stored (session_activity), not only the opening
};

std::optional<UserRecord> find_user_by_login(SQLite::Database& db, const std::string& login);
std::optional<UserRecord> find_user(SQLite::Database& db, std::int64_t id);
std::vector<UserRecord> all_users(SQLite::Database& db);
std::int64_t count_users(SQLite::Database& db);
/// The seq of the audit record that added the first account; none while the database has no accounts.
std::optional<std::int64_t> first_account_record(SQLite::Database& db);

std::optional<PasswordRecord> current_password(SQLite::Database& db, std::int64_t user_id);
/// The user's account events in order.
std::vector<AccountEvent> account_events(SQLite::Database& db, std::int64_t user_id);
/// The settings in force (the defaults when none were ever set).
SecuritySettings security_settings(SQLite::Database& db);

std::optional<SessionRecord> find_session_by_token_hash(SQLite::Database& db, const std::string& token_sha256);
/// Marks a session used now (session_activity is not a record: no audit record, updated in place).
void touch_session(SQLite::Database& db, std::int64_t session_id, const std::string& at);

std::int64_t add_user(Recorder& rec, const std::string& login, const std::string& full_name);
void add_password(Recorder& rec, std::int64_t user_id, const std::string& hash, bool must_change);
void add_account_event(Recorder& rec, std::int64_t user_id, const std::string& event, const std::string& role = "",
                       const std::string& reason = "");
void add_security_settings(Recorder& rec, const SecuritySettings& s);
std::int64_t add_session(Recorder& rec, std::int64_t user_id, const std::string& token_sha256, int idle_minutes);
void end_session(Recorder& rec, std::int64_t session_id, const std::string& why);

/// The user id of the audit record that wrote the row `table` `row_key` (its first record); none for a row
/// written before user accounts.
std::optional<std::int64_t> writer_of(SQLite::Database& db, const std::string& table, const std::string& row_key);

}  // namespace plumb::store
