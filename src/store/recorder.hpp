#pragma once
// The one place where plumb writes records. Every insert is mirrored in the audit trail with who,
// when, what and why, chained by SHA-256 so that a record changed behind plumb's back is detectable.
#include <SQLiteCpp/Database.h>
#include <SQLiteCpp/Statement.h>

#include <map>
#include <memory>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

namespace plumb::store {

struct Actor {
  std::string name;     ///< the --by name, as given (plumb does not authenticate people)
  std::string os_user;  ///< the operating-system account running plumb
};

/// The OS account name of this process.
std::string current_os_user();
/// Current UTC time, ISO 8601 with seconds and a Z.
std::string utc_timestamp();

class Recorder {
public:
  Recorder(SQLite::Database& db, Actor actor);

  /// Inserts `row` (column -> string, integer or null) into `table` and appends the audit record.
  /// `key_columns` name the primary key; a single integer key absent from `row` is taken from the
  /// new rowid. Returns the rowid.
  std::int64_t insert(const std::string& table, nlohmann::json row, const std::vector<std::string>& key_columns,
                      const std::string& reason = "");

  [[nodiscard]] const Actor& actor() const { return actor_; }
  [[nodiscard]] const std::string& now() const { return now_; }

private:
  /// A prepared statement for `sql`, reset for reuse: a batch import inserts millions of rows with a
  /// handful of distinct statements, and preparing each one anew would cost more than the insert.
  SQLite::Statement& statement(const std::string& sql);

  SQLite::Database& db_;
  Actor actor_;
  std::string now_;  ///< one timestamp for the whole command
  std::map<std::string, std::unique_ptr<SQLite::Statement>> statements_;
};

/// SHA-256 of `text` as lowercase hex (OpenSSL libcrypto).
std::string sha256_hex(std::string_view text);

/// The current row of `row` as a JSON object, column -> integer, text, real or null (a blob becomes
/// "blob:" and its SHA-256). The trail's `after_json` is this object as canonical JSON.
nlohmann::json row_json(SQLite::Statement& row);

/// The hash of an audit record: SHA-256 over the previous hash and the canonical JSON of the record.
std::string audit_hash(const std::string& prev_hash, const nlohmann::json& record);

}  // namespace plumb::store
