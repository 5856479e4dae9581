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

using nlohmann::json;

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
  static constexpr char hex_digits[] = "0123456789abcdef";
  std::string hex(2 * static_cast<std::size_t>(len), '0');
  for (unsigned int i = 0; i < len; ++i) {
    hex[2 * i] = hex_digits[digest[i] >> 4];
    hex[2 * i + 1] = hex_digits[digest[i] & 0x0f];
  }
  return hex;
}

std::string audit_hash(const std::string& prev_hash, const json& record) {
  // nlohmann::json objects keep keys sorted, so dump() is canonical.
  return sha256_hex(prev_hash + "\n" + record.dump());
}

json recorded_value(const json& stored) {
  if (stored.is_string() && stored.get_ref<const std::string&>().size() > long_text_bytes)
    return {{"sha256", sha256_hex(stored.get_ref<const std::string&>())}};
  return stored;
}

bool matches_recorded(const json& recorded, const json& stored) {
  if (recorded.is_object() && recorded.contains("sha256"))
    return stored.is_string() && stored.get_ref<const std::string&>().size() > long_text_bytes &&
           recorded["sha256"] == sha256_hex(stored.get_ref<const std::string&>());
  return recorded == stored;
}

json row_json(SQLite::Statement& row) {
  json j = json::object();
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

const TableSchema& Recorder::schema(const std::string& table) {
  auto it = schemas_.find(table);
  if (it == schemas_.end()) {
    it = schemas_.emplace(table, read_table_schema(db_, table)).first;
    if (it->second.columns.empty()) throw StorageError(fmt::format("table {} does not exist.", table));
  }
  return it->second;
}

Recorder::Written Recorder::write_row(const std::string& table, const json& row,
                                      const std::vector<std::string>& key_columns) {
  const TableSchema& s = schema(table);
  // The trail records the row as stored without reading it back: so each value must be stored exactly as
  // given (an integer in an INTEGER column, a text in a TEXT column), and unmentioned columns take their
  // literal defaults.
  std::string columns, marks;
  for (const auto& [name, value] : row.items()) {
    const ColumnSchema* c = s.column(name);
    if (!c) throw StorageError(fmt::format("table {} has no column {}.", table, name));
    const bool fits = value.is_null() || (c->type == "INTEGER" && value.is_number_integer()) ||
                      (c->type == "TEXT" && value.is_string());
    if (!fits)
      throw StorageError(fmt::format("column {}.{} ({}) cannot store {} exactly (exact values only).", table, name,
                                     c->type, value.dump()));
    columns += (columns.empty() ? "" : ", ") + name;
    marks += marks.empty() ? "?" : ", ?";
  }
  SQLite::Statement& insert = statement(fmt::format("INSERT INTO {} ({}) VALUES ({})", table, columns, marks));
  int i = 1;
  for (const auto& [name, value] : row.items()) {
    if (value.is_null()) insert.bind(i);
    else if (value.is_number_integer()) insert.bind(i, value.get<std::int64_t>());
    else insert.bind(i, value.get_ref<const std::string&>());
    ++i;
  }
  insert.exec();

  Written w;
  w.rowid = db_.getLastInsertRowid();
  w.recorded = json::object();
  for (const auto& c : s.columns) {
    const auto given = row.find(c.name);
    if (given != row.end()) w.recorded[c.name] = recorded_value(*given);
    else if (c.rowid_alias) w.recorded[c.name] = w.rowid;
    else w.recorded[c.name] = c.default_value;
  }
  w.key = key_text(key_columns, w.recorded);
  return w;
}

void Recorder::append_audit(const std::string& action, const std::string& table, const std::string& key,
                            const std::string& after_json, const std::string& reason) {
  // Read the chain's tail every time (never cached): it is cheap with a prepared statement, and always right.
  SQLite::Statement& last = statement("SELECT seq, hash FROM audit_log ORDER BY seq DESC LIMIT 1");
  std::int64_t seq = 1;
  std::string prev = std::string(64, '0');
  if (last.executeStep()) {
    seq = last.getColumn(0).getInt64() + 1;
    prev = last.getColumn(1).getString();
  }
  last.reset();  // no read cursor left open between inserts
  const json record = {{"seq", seq},          {"at", now_},          {"os_user", actor_.os_user},
                       {"actor", actor_.name}, {"action", action},    {"table_name", table},
                       {"row_key", key},       {"before_json", nullptr}, {"after_json", after_json},
                       {"reason", reason.empty() ? json() : json(reason)}};
  const std::string hash = audit_hash(prev, record);
  SQLite::Statement& audit =
      statement("INSERT INTO audit_log (seq, at, os_user, actor, action, table_name, row_key, before_json, "
                "after_json, reason, prev_hash, hash) VALUES (?, ?, ?, ?, ?, ?, ?, NULL, ?, ?, ?, ?)");
  audit.bind(1, seq);
  audit.bind(2, now_);
  audit.bind(3, actor_.os_user);
  audit.bind(4, actor_.name);
  audit.bind(5, action);
  audit.bind(6, table);
  audit.bind(7, key);
  audit.bind(8, after_json);
  if (reason.empty()) audit.bind(9);
  else audit.bind(9, reason);
  audit.bind(10, prev);
  audit.bind(11, hash);
  audit.exec();
}

std::int64_t Recorder::insert(const std::string& table, const json& row, const std::vector<std::string>& key_columns,
                              const std::string& reason) {
  const Written w = write_row(table, row, key_columns);
  append_audit("insert", table, w.key, w.recorded.dump(), reason);
  return w.rowid;
}

void Recorder::insert_together(const std::string& reason, const std::function<void(RowGroup&)>& fill) {
  RowGroup group(*this);
  fill(group);
  if (group.first_table_.empty()) throw StorageError("an audited group of rows must hold at least one row.");
  append_audit("insert rows", group.first_table_, group.first_key_, group.tables_.dump(), reason);
}

std::int64_t RowGroup::insert(const std::string& table, const json& row, const std::vector<std::string>& key_columns) {
  Recorder::Written w = rec_.write_row(table, row, key_columns);
  if (first_table_.empty()) {
    first_table_ = table;
    first_key_ = w.key;
  }
  tables_[table].push_back(std::move(w.recorded));
  return w.rowid;
}

}  // namespace plumb::store
