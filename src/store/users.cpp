#include "store/users.hpp"

#include <SQLiteCpp/Statement.h>

namespace plumb::store {
namespace {

std::string account_column_text(const SQLite::Column& c) {
  return c.isNull() ? std::string() : c.getString();
}

constexpr const char* user_select = "SELECT id, login, full_name, created_at FROM users";

UserRecord user_from(SQLite::Statement& q) {
  return {q.getColumn(0).getInt64(), q.getColumn(1).getString(), q.getColumn(2).getString(),
          q.getColumn(3).getString()};
}

Value account_text_or_null(const std::string& s) {
  return s.empty() ? Value() : Value(s);
}

}  // namespace

std::optional<UserRecord> find_user_by_login(SQLite::Database& db, const std::string& login) {
  SQLite::Statement q(db, std::string(user_select) + " WHERE login = ?");
  q.bind(1, login);
  if (!q.executeStep()) return std::nullopt;
  return user_from(q);
}

std::optional<UserRecord> find_user(SQLite::Database& db, std::int64_t id) {
  SQLite::Statement q(db, std::string(user_select) + " WHERE id = ?");
  q.bind(1, id);
  if (!q.executeStep()) return std::nullopt;
  return user_from(q);
}

std::vector<UserRecord> all_users(SQLite::Database& db) {
  SQLite::Statement q(db, std::string(user_select) + " ORDER BY id");
  std::vector<UserRecord> out;
  while (q.executeStep()) out.push_back(user_from(q));
  return out;
}

std::int64_t count_users(SQLite::Database& db) {
  return db.execAndGet("SELECT count(*) FROM users").getInt64();
}

std::optional<std::int64_t> first_account_record(SQLite::Database& db) {
  // The first account's own record opens the era of accounts (the index on table_name finds it at once).
  const auto seq = db.execAndGet("SELECT min(seq) FROM audit_log WHERE table_name = 'users'");
  if (seq.isNull()) return std::nullopt;
  return seq.getInt64();
}

std::optional<PasswordRecord> current_password(SQLite::Database& db, std::int64_t user_id) {
  SQLite::Statement q(db,
                      "SELECT id, hash, must_change, set_at FROM passwords WHERE user_id = ? ORDER BY id DESC LIMIT 1");
  q.bind(1, user_id);
  if (!q.executeStep()) return std::nullopt;
  return PasswordRecord{q.getColumn(0).getInt64(), q.getColumn(1).getString(), q.getColumn(2).getInt() != 0,
                        q.getColumn(3).getString()};
}

std::vector<AccountEvent> account_events(SQLite::Database& db, std::int64_t user_id) {
  SQLite::Statement q(db,
                      "SELECT id, user_id, event, role, reason, at FROM account_events WHERE user_id = ? ORDER BY id");
  q.bind(1, user_id);
  std::vector<AccountEvent> out;
  while (q.executeStep())
    out.push_back({q.getColumn(0).getInt64(), q.getColumn(1).getInt64(), q.getColumn(2).getString(),
                   account_column_text(q.getColumn(3)), account_column_text(q.getColumn(4)),
                   q.getColumn(5).getString()});
  return out;
}

SecuritySettings security_settings(SQLite::Database& db) {
  SQLite::Statement q(db,
                      "SELECT min_password_length, max_failed_logins, idle_minutes, password_max_age_days, "
                      "password_hashing, set_at FROM security_settings ORDER BY id DESC LIMIT 1");
  SecuritySettings s;
  if (!q.executeStep()) return s;
  s.min_password_length = q.getColumn(0).getInt();
  s.max_failed_logins = q.getColumn(1).getInt();
  s.idle_minutes = q.getColumn(2).getInt();
  if (!q.getColumn(3).isNull()) s.password_max_age_days = q.getColumn(3).getInt();
  s.password_hashing = q.getColumn(4).getString();
  s.set_at = q.getColumn(5).getString();
  return s;
}

std::optional<SessionRecord> find_session_by_token_hash(SQLite::Database& db, const std::string& token_sha256) {
  SQLite::Statement q(db,
                      "SELECT s.id, s.user_id, s.opened_at, s.idle_minutes, e.ended_at, a.last_used_at FROM sessions s "
                      "LEFT JOIN session_ends e ON e.session_id = s.id "
                      "LEFT JOIN session_activity a ON a.session_id = s.id WHERE s.token_sha256 = ?");
  q.bind(1, token_sha256);
  if (!q.executeStep()) return std::nullopt;
  SessionRecord s;
  s.id = q.getColumn(0).getInt64();
  s.user_id = q.getColumn(1).getInt64();
  s.opened_at = q.getColumn(2).getString();
  s.idle_minutes = q.getColumn(3).getInt();
  if (!q.getColumn(4).isNull()) s.ended_at = q.getColumn(4).getString();
  s.used = !q.getColumn(5).isNull();
  s.last_used_at = s.used ? q.getColumn(5).getString() : s.opened_at;
  return s;
}

void touch_session(SQLite::Database& db, std::int64_t session_id, const std::string& at) {
  SQLite::Statement q(db,
                      "INSERT INTO session_activity (session_id, last_used_at) VALUES (?, ?) "
                      "ON CONFLICT (session_id) DO UPDATE SET last_used_at = excluded.last_used_at");
  q.bind(1, session_id);
  q.bind(2, at);
  q.exec();
}

std::int64_t add_user(Recorder& rec, const std::string& login, const std::string& full_name) {
  return rec.insert("users", {{"login", login}, {"full_name", full_name}, {"created_at", rec.now()}}, {"id"});
}

void add_password(Recorder& rec, std::int64_t user_id, const std::string& hash, bool must_change) {
  rec.insert("passwords",
             {{"user_id", user_id}, {"hash", hash}, {"must_change", must_change ? 1 : 0}, {"set_at", rec.now()}},
             {"id"});
}

void add_account_event(Recorder& rec, std::int64_t user_id, const std::string& event, const std::string& role,
                       const std::string& reason) {
  rec.insert("account_events",
             {{"user_id", user_id},
              {"event", event},
              {"role", account_text_or_null(role)},
              {"reason", account_text_or_null(reason)},
              {"at", rec.now()}},
             {"id"}, reason);
}

void add_security_settings(Recorder& rec, const SecuritySettings& s) {
  rec.insert("security_settings",
             {{"min_password_length", s.min_password_length},
              {"max_failed_logins", s.max_failed_logins},
              {"idle_minutes", s.idle_minutes},
              {"password_max_age_days", s.password_max_age_days},
              {"password_hashing", s.password_hashing},
              {"set_at", rec.now()}},
             {"id"});
}

std::int64_t add_session(Recorder& rec, std::int64_t user_id, const std::string& token_sha256, int idle_minutes) {
  return rec.insert(
      "sessions",
      {{"user_id", user_id}, {"token_sha256", token_sha256}, {"opened_at", rec.now()}, {"idle_minutes", idle_minutes}},
      {"id"});
}

void end_session(Recorder& rec, std::int64_t session_id, const std::string& why) {
  rec.insert("session_ends", {{"session_id", session_id}, {"ended_at", rec.now()}, {"why", why}}, {"session_id"});
}

std::optional<std::int64_t> writer_of(SQLite::Database& db, const std::string& table, const std::string& row_key) {
  SQLite::Statement q(db, "SELECT user_id FROM audit_log WHERE table_name = ? AND row_key = ? ORDER BY seq LIMIT 1");
  q.bind(1, table);
  q.bind(2, row_key);
  if (!q.executeStep() || q.getColumn(0).isNull()) return std::nullopt;
  return q.getColumn(0).getInt64();
}

}  // namespace plumb::store
