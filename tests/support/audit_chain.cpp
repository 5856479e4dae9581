#include "support/audit_chain.hpp"

#include <SQLiteCpp/Database.h>
#include <SQLiteCpp/Statement.h>

#include <nlohmann/json.hpp>

#include "store/recorder.hpp"

namespace plumb::test {

nlohmann::json hashed_audit_record(const SQLite::Statement& q, int user_id_column) {
  const auto text_or_null = [&q](int i) {
    return q.getColumn(i).isNull() ? nlohmann::json() : nlohmann::json(q.getColumn(i).getString());
  };
  nlohmann::json record = {{"seq", q.getColumn(0).getInt64()},      {"at", q.getColumn(1).getString()},
                           {"os_user", q.getColumn(2).getString()}, {"actor", q.getColumn(3).getString()},
                           {"action", q.getColumn(4).getString()},  {"table_name", q.getColumn(5).getString()},
                           {"row_key", q.getColumn(6).getString()}, {"before_json", text_or_null(7)},
                           {"after_json", text_or_null(8)},         {"reason", text_or_null(9)}};
  // Since user accounts (schema/011_users.sql) a record names its account, and its hash covers the id.
  if (!q.getColumn(user_id_column).isNull()) record["user_id"] = q.getColumn(user_id_column).getInt64();
  return record;
}

AuditCheck check_audit_chain(const std::filesystem::path& db) {
  SQLite::Database sql(db.string(), SQLite::OPEN_READONLY);
  sql.setBusyTimeout(30000);
  SQLite::Statement q(sql,
                      "SELECT seq, at, os_user, actor, action, table_name, row_key, before_json, after_json, "
                      "reason, prev_hash, hash, user_id FROM audit_log ORDER BY seq");
  AuditCheck check;
  std::string prev(64, '0');
  while (q.executeStep()) {
    ++check.rows;
    const long long seq = q.getColumn(0).getInt64();
    if (seq != check.rows) {
      check.problem = "seq " + std::to_string(seq) + " where " + std::to_string(check.rows) + " was expected";
      return check;
    }
    if (q.getColumn(10).getString() != prev) {
      check.problem = "seq " + std::to_string(seq) + ": prev_hash is not the previous row's hash";
      return check;
    }
    const nlohmann::json record = hashed_audit_record(q, 12);
    prev = q.getColumn(11).getString();
    if (store::audit_hash(q.getColumn(10).getString(), record) != prev) {
      check.problem = "seq " + std::to_string(seq) + ": hash does not match its record";
      return check;
    }
  }
  return check;
}

long long account_records(const std::filesystem::path& db) {
  SQLite::Database sql(db.string(), SQLite::OPEN_READONLY);
  sql.setBusyTimeout(30000);
  return sql
      .execAndGet(
          "SELECT count(*) FROM audit_log WHERE table_name IN ('users', 'passwords', 'account_events', "
          "'security_settings', 'sessions', 'session_ends')")
      .getInt64();
}

long long account_checkpoints(const std::filesystem::path& db) {
  SQLite::Database sql(db.string(), SQLite::OPEN_READONLY);
  sql.setBusyTimeout(30000);
  return sql
      .execAndGet(
          "SELECT count(*) FROM checkpoints c WHERE NOT EXISTS (SELECT 1 FROM audit_log a WHERE a.seq > "
          "coalesce((SELECT p.records FROM checkpoints p WHERE p.number = c.number - 1), 0) AND a.seq <= "
          "c.records AND a.table_name NOT IN ('users', 'passwords', 'account_events', 'security_settings', "
          "'sessions', 'session_ends'))")
      .getInt64();
}

}  // namespace plumb::test
