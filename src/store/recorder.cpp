#include "store/recorder.hpp"

#include <SQLiteCpp/Statement.h>
#include <fmt/chrono.h>
#include <fmt/format.h>
#include <openssl/evp.h>
#include <pwd.h>
#include <unistd.h>

#include <chrono>
#include <algorithm>
#include <cstdlib>

#include "core/errors.hpp"
#include "store/canonical_json.hpp"

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

Recorder::Writer& Recorder::writer(const std::string& table, const Row& row, std::size_t rows) {
  const auto same_shape = [&](const Writer& w) {
    if (w.table != table || w.rows != rows || w.columns.size() != row.size()) return false;
    for (std::size_t i = 0; i < row.size(); ++i)
      if (w.columns[i] != row[i].column) return false;
    return true;
  };
  for (auto& w : writers_)
    if (same_shape(*w)) return *w;

  auto w = std::make_unique<Writer>();
  w->table = table;
  w->rows = rows;
  w->schema = &schema(table);
  std::string columns, marks;
  for (const auto& f : row) {
    const ColumnSchema* c = w->schema->column(f.column);
    if (!c) throw StorageError(fmt::format("table {} has no column {}.", table, f.column));
    if (c->type != "INTEGER" && c->type != "TEXT")
      throw StorageError(fmt::format("column {}.{} has type {}; plumb stores integers and texts only.", table,
                                     f.column, c->type));
    w->columns.emplace_back(f.column);
    w->kinds.push_back(c->type == "INTEGER" ? Value::Kind::integer : Value::Kind::text);
    columns += (columns.empty() ? "" : ", ") + std::string(f.column);
    marks += marks.empty() ? "?" : ", ?";
  }
  for (const auto& c : w->schema->columns) {
    const auto at = std::find(w->columns.begin(), w->columns.end(), c.name);
    w->given.push_back(at == w->columns.end() ? -1 : static_cast<int>(at - w->columns.begin()));
  }
  std::string values;
  for (std::size_t i = 0; i < rows; ++i) values += fmt::format("{}({})", i ? ", " : "", marks);
  w->insert = std::make_unique<SQLite::Statement>(db_, fmt::format("INSERT INTO {} ({}) VALUES {}", table, columns, values));
  writers_.push_back(std::move(w));
  return *writers_.back();
}

void Recorder::bind_row(Writer& w, const Row& row, std::size_t first_parameter) {
  // The trail records the row as stored without reading it back: so each value must be stored exactly as
  // given (an integer in an INTEGER column, a text in a TEXT column; no type conversion by SQLite).
  if (row.size() != w.columns.size()) throw StorageError(fmt::format("rows of {} differ in their columns.", w.table));
  for (std::size_t i = 0; i < row.size(); ++i) {
    if (row[i].column != w.columns[i]) throw StorageError(fmt::format("rows of {} differ in their columns.", w.table));
    const Value& v = row[i].value;
    const int at = static_cast<int>(first_parameter + i);
    if (v.is_null()) {
      w.insert->bind(at);
      continue;
    }
    if (v.kind() != w.kinds[i])
      throw StorageError(fmt::format("column {}.{} cannot store {} exactly (exact values only).", w.table,
                                     row[i].column, v.kind() == Value::Kind::integer ? "an integer" : "a text"));
    if (v.kind() == Value::Kind::integer) w.insert->bind(at, v.integer());
    else w.insert->bind(at, v.text());
  }
}

void Recorder::append_recorded(const Writer& w, const Row& row, std::int64_t rowid, std::string& recorded) {
  recorded += '{';
  for (std::size_t i = 0; i < w.schema->columns.size(); ++i) {
    const ColumnSchema& c = w.schema->columns[i];
    if (i > 0) recorded += ',';
    append_json_string(recorded, c.name);
    recorded += ':';
    if (w.given[i] >= 0) {
      const Value* v = &row[static_cast<std::size_t>(w.given[i])].value;
      if (v->kind() == Value::Kind::text && v->text().size() > long_text_bytes) {
        recorded += R"({"sha256":")";  // a long text: its digest (see long_text_bytes)
        recorded += sha256_hex(v->text());
        recorded += "\"}";
      } else {
        append_json_value(recorded, *v);
      }
    } else if (c.rowid_alias) {
      fmt::format_to(std::back_inserter(recorded), "{}", rowid);
    } else {
      recorded += c.default_value.dump();
    }
  }
  recorded += '}';
}

Recorder::Written Recorder::write_row(const std::string& table, const Row& row,
                                      const std::vector<std::string>& key_columns, std::string& recorded) {
  Writer& w = writer(table, row, 1);
  w.insert->reset();
  w.insert->clearBindings();
  bind_row(w, row, 1);
  w.insert->exec();

  Written out;
  out.rowid = db_.getLastInsertRowid();
  append_recorded(w, row, out.rowid, recorded);
  for (const auto& k : key_columns) {
    if (!out.key.empty()) out.key += ',';
    out.key += k;
    out.key += '=';
    const auto f = std::find_if(row.begin(), row.end(), [&](const Field& x) { return x.column == k; });
    const ColumnSchema* c = w.schema->column(k);
    if (f == row.end() && c && c->rowid_alias) out.key += std::to_string(out.rowid);
    else if (f == row.end()) out.key += '?';
    else if (f->value.is_null()) out.key += "null";
    else if (f->value.kind() == Value::Kind::integer) out.key += std::to_string(f->value.integer());
    else out.key += f->value.text();
  }
  return out;
}

void Recorder::write_rows(const std::string& table, const std::vector<Row>& rows, std::string& recorded) {
  constexpr std::size_t per_statement = 16;
  for (std::size_t from = 0; from < rows.size(); from += per_statement) {
    const std::size_t n = std::min(per_statement, rows.size() - from);
    Writer& w = writer(table, rows[from], n);
    for (const auto& c : w.schema->columns)
      if (c.rowid_alias && std::none_of(rows[from].begin(), rows[from].end(),
                                        [&](const Field& f) { return f.column == c.name; }))
        throw StorageError(fmt::format("rows of {} written together must give their key {}.", table, c.name));
    w.insert->reset();
    w.insert->clearBindings();
    for (std::size_t i = 0; i < n; ++i) bind_row(w, rows[from + i], 1 + i * w.columns.size());
    w.insert->exec();
    for (std::size_t i = 0; i < n; ++i) {
      if (from + i > 0) recorded += ',';
      append_recorded(w, rows[from + i], 0, recorded);
    }
  }
}

std::string canonical_audit_json(const AuditContent& c) {
  const auto text_or_null = [](std::string& out, const std::string* s) {
    if (s) append_json_string(out, *s);
    else out += "null";
  };
  // Keys in sorted order, as nlohmann::json keeps them.
  std::string out = R"({"action":)";
  append_json_string(out, c.action);
  out += R"(,"actor":)";
  append_json_string(out, c.actor);
  out += R"(,"after_json":)";
  text_or_null(out, c.after_json);
  out += R"(,"at":)";
  append_json_string(out, c.at);
  out += R"(,"before_json":)";
  text_or_null(out, c.before_json);
  out += R"(,"os_user":)";
  append_json_string(out, c.os_user);
  out += R"(,"reason":)";
  text_or_null(out, c.reason);
  out += R"(,"row_key":)";
  append_json_string(out, c.row_key);
  fmt::format_to(std::back_inserter(out), R"(,"seq":{},"table_name":)", c.seq);
  append_json_string(out, c.table_name);
  out += '}';
  return out;
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
  AuditContent content;
  content.seq = seq;
  content.at = now_;
  content.os_user = actor_.os_user;
  content.actor = actor_.name;
  content.action = action;
  content.table_name = table;
  content.row_key = key;
  content.after_json = &after_json;
  content.reason = reason.empty() ? nullptr : &reason;
  const std::string hash = sha256_hex(prev + "\n" + canonical_audit_json(content));
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

std::int64_t Recorder::insert(const std::string& table, const Row& row, const std::vector<std::string>& key_columns,
                              const std::string& reason) {
  std::string recorded;
  const Written w = write_row(table, row, key_columns, recorded);
  append_audit("insert", table, w.key, recorded, reason);
  return w.rowid;
}

void Recorder::insert_together(const std::string& reason, const std::function<void(RowGroup&)>& fill) {
  RowGroup group(*this);
  fill(group);
  if (group.first_table_.empty()) throw StorageError("an audited group of rows must hold at least one row.");
  // {"table":[rows],...}: each table's rows in the order they were inserted.
  std::string after = "{";
  for (const auto& [table, rows] : group.tables_) {
    if (after.size() > 1) after += ',';
    append_json_string(after, table);
    after += ":[";
    after += rows;
    after += ']';
  }
  after += '}';
  append_audit("insert rows", group.first_table_, group.first_key_, after, reason);
}

std::string& RowGroup::rows_of(const std::string& table) {
  auto it = std::find_if(tables_.begin(), tables_.end(), [&](const auto& t) { return t.first == table; });
  if (it == tables_.end()) {
    tables_.emplace_back(table, std::string());
    return tables_.back().second;
  }
  it->second += ',';
  return it->second;
}

std::int64_t RowGroup::insert(const std::string& table, const Row& row, const std::vector<std::string>& key_columns) {
  const Recorder::Written w = rec_.write_row(table, row, key_columns, rows_of(table));
  if (first_table_.empty()) {
    first_table_ = table;
    first_key_ = w.key;
  }
  return w.rowid;
}

void RowGroup::insert_rows(const std::string& table, const std::vector<Row>& rows) {
  if (rows.empty()) return;
  if (first_table_.empty()) throw StorageError("a group of rows starts with a single row, whose key names the group.");
  rec_.write_rows(table, rows, rows_of(table));
}

}  // namespace plumb::store
