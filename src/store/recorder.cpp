#include "store/recorder.hpp"

#include <SQLiteCpp/Statement.h>
#include <fmt/chrono.h>
#include <fmt/format.h>
#include <openssl/evp.h>
#include <pwd.h>
#include <unistd.h>

#include <chrono>
#include <cstdlib>

#include "core/errors.hpp"

namespace plumb::store {

std::string current_os_user() {
  if (const passwd* pw = getpwuid(geteuid()); pw && pw->pw_name) return pw->pw_name;
  if (const char* u = std::getenv("USER"); u && *u) return u;
  return fmt::format("uid-{}", geteuid());
}

std::string utc_timestamp() {
  const auto now = std::chrono::floor<std::chrono::seconds>(std::chrono::system_clock::now());
  return fmt::format("{:%Y-%m-%dT%H:%M:%SZ}", fmt::gmtime(std::chrono::system_clock::to_time_t(now)));
}

std::string sha256_hex(std::string_view text) {
  unsigned char digest[EVP_MAX_MD_SIZE];
  unsigned int len = 0;
  if (EVP_Digest(text.data(), text.size(), digest, &len, EVP_sha256(), nullptr) != 1)
    throw StorageError("SHA-256 computation failed in OpenSSL.");
  std::string hex;
  for (unsigned int i = 0; i < len; ++i) hex += fmt::format("{:02x}", digest[i]);
  return hex;
}

std::string audit_hash(const std::string& prev_hash, const nlohmann::json& record) {
  // nlohmann::json objects keep keys sorted, so dump() is canonical.
  return sha256_hex(prev_hash + "\n" + record.dump());
}

nlohmann::json row_json(SQLite::Statement& row) {
  nlohmann::json j = nlohmann::json::object();
  for (int i = 0; i < row.getColumnCount(); ++i) {
    const SQLite::Column c = row.getColumn(i);
    if (c.isNull()) j[c.getName()] = nullptr;
    else if (c.isInteger()) j[c.getName()] = c.getInt64();
    else if (c.isFloat()) j[c.getName()] = c.getDouble();
    else if (c.isText()) j[c.getName()] = c.getString();
    else j[c.getName()] = "blob:" + sha256_hex(std::string_view(static_cast<const char*>(c.getBlob()),
                                                                static_cast<std::size_t>(c.getBytes())));
  }
  return j;
}

Recorder::Recorder(SQLite::Database& db, Actor actor) : db_(db), actor_(std::move(actor)), now_(utc_timestamp()) {}

SQLite::Statement& Recorder::statement(const std::string& sql) {
  auto& s = statements_[sql];
  if (!s) s = std::make_unique<SQLite::Statement>(db_, sql);
  s->reset();
  s->clearBindings();
  return *s;
}

std::int64_t Recorder::insert(const std::string& table, nlohmann::json row, const std::vector<std::string>& key_columns,
                              const std::string& reason) {
  std::string columns, marks;
  for (const auto& [name, _] : row.items()) {
    columns += (columns.empty() ? "" : ", ") + name;
    marks += marks.empty() ? "?" : ", ?";
  }
  SQLite::Statement& insert = statement(fmt::format("INSERT INTO {} ({}) VALUES ({})", table, columns, marks));
  int i = 1;
  for (const auto& [name, value] : row.items()) {
    if (value.is_null()) insert.bind(i);
    else if (value.is_number_integer()) insert.bind(i, value.get<std::int64_t>());
    else if (value.is_string()) insert.bind(i, value.get<std::string>());
    else throw StorageError(fmt::format("column {}.{} must be text, integer or null (exact values only).", table, name));
    ++i;
  }
  insert.exec();
  const std::int64_t rowid = db_.getLastInsertRowid();
  // The trail records the row as stored (every column, defaults included), so that `audit verify` can
  // compare each column of the table with what was recorded.
  SQLite::Statement& stored = statement(fmt::format("SELECT * FROM {} WHERE rowid = ?", table));
  stored.bind(1, rowid);
  if (!stored.executeStep()) throw StorageError(fmt::format("row {} of {} vanished after insert.", rowid, table));
  row = row_json(stored);

  std::string key;
  for (const auto& k : key_columns) {
    const auto& v = row.at(k);
    key += fmt::format("{}{}={}", key.empty() ? "" : ",", k, v.is_string() ? v.get<std::string>() : v.dump());
  }

  // Read the chain's tail every time (never cached): it is cheap with a prepared statement, and always right.
  SQLite::Statement& last = statement("SELECT seq, hash FROM audit_log ORDER BY seq DESC LIMIT 1");
  std::int64_t seq = 1;
  std::string prev = std::string(64, '0');
  if (last.executeStep()) {
    seq = last.getColumn(0).getInt64() + 1;
    prev = last.getColumn(1).getString();
  }
  last.reset();  // no read cursor left open between inserts
  const std::string after = row.dump();
  nlohmann::json record = {{"seq", seq},          {"at", now_},         {"os_user", actor_.os_user},
                           {"actor", actor_.name}, {"action", "insert"}, {"table_name", table},
                           {"row_key", key},       {"before_json", nullptr}, {"after_json", after},
                           {"reason", reason.empty() ? nlohmann::json() : nlohmann::json(reason)}};
  const std::string hash = audit_hash(prev, record);
  SQLite::Statement& audit =
      statement("INSERT INTO audit_log (seq, at, os_user, actor, action, table_name, row_key, before_json, "
                "after_json, reason, prev_hash, hash) VALUES (?, ?, ?, ?, ?, ?, ?, NULL, ?, ?, ?, ?)");
  audit.bind(1, seq);
  audit.bind(2, now_);
  audit.bind(3, actor_.os_user);
  audit.bind(4, actor_.name);
  audit.bind(5, "insert");
  audit.bind(6, table);
  audit.bind(7, key);
  audit.bind(8, after);
  if (reason.empty()) audit.bind(9);
  else audit.bind(9, reason);
  audit.bind(10, prev);
  audit.bind(11, hash);
  audit.exec();
  return rowid;
}

}  // namespace plumb::store
