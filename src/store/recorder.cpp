#include "store/recorder.hpp"

#include <SQLiteCpp/Statement.h>
#include <fmt/chrono.h>
#include <fmt/format.h>
#include <openssl/evp.h>
#include <sqlite3.h>
#include <pwd.h>
#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <cstdlib>
#include <memory>
#include <tuple>

#include "core/errors.hpp"
#include "core/text_field.hpp"
#include "store/canonical_json.hpp"
#include "store/checkpoints.hpp"

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
  // The digest fetched once and one context per thread: OpenSSL 3 looks EVP_sha256() up again on every
  // EVP_Digest call, which costs more than hashing a short audit record with the CPU's SHA instructions.
  static EVP_MD* const sha256 = EVP_MD_fetch(nullptr, "SHA256", nullptr);
  thread_local const std::unique_ptr<EVP_MD_CTX, decltype(&EVP_MD_CTX_free)> ctx(EVP_MD_CTX_new(), &EVP_MD_CTX_free);
  unsigned char digest[EVP_MAX_MD_SIZE];
  unsigned int len = 0;
  if (!sha256 || !ctx || EVP_DigestInit_ex2(ctx.get(), sha256, nullptr) != 1 ||
      EVP_DigestUpdate(ctx.get(), text.data(), text.size()) != 1 || EVP_DigestFinal_ex(ctx.get(), digest, &len) != 1)
    throw StorageError("SHA-256 computation failed in OpenSSL.");
  static constexpr char hex_digits[] = "0123456789abcdef";
  std::string hex(2 * static_cast<std::size_t>(len), '0');
  for (std::size_t i = 0; i < len; ++i) {
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

Recorder::Recorder(SQLite::Database& db, Actor actor) : db_(db), actor_(std::move(actor)), now_(utc_timestamp()) {
  // Who is recorded in every audit record: plain text on one line, like every stored text.
  check_text_field(actor_.name, "the user's printed name");
  const char* file = sqlite3_db_filename(db_.getHandle(), "main");
  if (file && *file) key_ = LabKey::load(key_path_for(file));
}

void Recorder::commit(SQLite::Transaction& tx) {
  if (!key_) throw StorageError("records of an in-memory database cannot be signed: it has no lab key.");
  write_checkpoint(db_, *key_, first_seq_);
  tx.commit();
}

SQLite::Statement& Recorder::statement(const std::string& sql) {
  auto& s = statements_[sql];
  if (!s) s = std::make_unique<SQLite::Statement>(db_, sql);
  s->reset();
  s->clearBindings();
  return *s;
}

// ---- Computing ----

const TableSchema& Recorder::schema(const std::string& table) {
  auto it = schemas_.find(table);
  if (it == schemas_.end()) {
    if (batch_) throw StorageError(fmt::format("table {} was not named when the batch began.", table));
    it = schemas_.emplace(table, read_table_schema(db_, table)).first;
    if (it->second.columns.empty()) throw StorageError(fmt::format("table {} does not exist.", table));
  }
  return it->second;
}

std::int64_t Recorder::next_rowid(const std::string& table) {
  auto it = next_rowid_.find(table);
  if (it == next_rowid_.end()) {
    if (batch_) throw StorageError(fmt::format("table {} was not named when the batch began.", table));
    // What SQLite itself would choose for a table without AUTOINCREMENT: one more than the largest rowid.
    SQLite::Statement& q = statement(fmt::format("SELECT coalesce(max(rowid), 0) + 1 FROM {}", table));
    q.executeStep();
    it = next_rowid_.emplace(table, q.getColumn(0).getInt64()).first;
    q.reset();
  }
  return it->second++;
}

std::pair<std::int64_t, std::string> Recorder::chain_tail() {
  if (batch_) return {tail_seq_, tail_hash_};
  // Outside a batch, read the tail every time (never cached): cheap with a prepared statement, always right.
  SQLite::Statement& last = statement("SELECT seq, hash FROM audit_log ORDER BY seq DESC LIMIT 1");
  std::pair<std::int64_t, std::string> tail{0, std::string(64, '0')};
  if (last.executeStep()) tail = {last.getColumn(0).getInt64(), last.getColumn(1).getString()};
  last.reset();  // no read cursor left open between inserts
  return tail;
}

namespace {

/// A value as the trail records it: a long text by its digest (see long_text_bytes), anything else as JSON.
void append_recorded_value(std::string& out, const Value& v) {
  if (v.kind() == Value::Kind::text && v.text().size() > long_text_bytes) {
    out += R"({"sha256":")";
    out += sha256_hex(v.text());
    out += "\"}";
  } else {
    append_json_value(out, v);
  }
}

}  // namespace

void Recorder::append_recorded(const TableSchema& schema, const Row& row, std::int64_t rowid, std::string& recorded) {
  recorded += '{';
  for (std::size_t i = 0; i < row.size(); ++i) {
    if (i > 0) recorded += ',';
    append_json_string(recorded, row[i].column);
    recorded += ':';
    append_recorded_value(recorded, row[i].value);
  }
  if (row.size() < schema.columns.size())  // columns the insert leaves to SQLite: their defaults, or the rowid
    for (const auto& c : schema.columns) {
      if (std::any_of(row.begin(), row.end(), [&](const Field& f) { return f.column == c.name; })) continue;
      recorded += ',';
      append_json_string(recorded, c.name);
      recorded += ':';
      if (c.rowid_alias) append_json_integer(recorded, rowid);
      else recorded += c.default_value.dump();
    }
  recorded += '}';
}

void Recorder::chain(PreparedGroup& g) {
  auto [seq, prev] = chain_tail();
  g.seq = seq + 1;
  if (first_seq_ == 0) first_seq_ = g.seq;
  g.prev_hash = std::move(prev);
  g.hash = audit_hash_of(g);
  if (batch_) {  // the next record follows this one, written or not yet
    tail_seq_ = g.seq;
    tail_hash_ = g.hash;
  }
}

std::string Recorder::audit_hash_of(const PreparedGroup& g) const {
  AuditContent content;
  content.seq = g.seq;
  content.at = now_;
  content.os_user = actor_.os_user;
  content.actor = actor_.name;
  content.action = g.action;
  content.table_name = g.table;
  content.row_key = g.key;
  content.after_json = &g.after_json;
  content.reason = g.reason.empty() ? nullptr : &g.reason;
  content.user_id = actor_.user_id;
  std::string hashed;
  hashed.reserve(g.prev_hash.size() + 2 * g.after_json.size() + 512);  // escaping may double a text
  hashed += g.prev_hash;
  hashed += '\n';
  append_canonical_audit_json(hashed, content);
  return sha256_hex(hashed);
}

namespace {

/// The key of a row about to be written: the same text store::key_text gives for the row as recorded, which
/// is how `audit verify` pairs table rows with the trail.
std::string key_text(const Row& row, const std::vector<std::string>& key_columns) {
  std::string key;
  for (const auto& k : key_columns) {
    if (!key.empty()) key += ',';
    key += k;
    key += '=';
    const auto f = std::find_if(row.begin(), row.end(), [&](const Field& x) { return x.column == k; });
    if (f == row.end()) key += '?';
    else if (f->value.is_null()) key += "null";
    else if (f->value.kind() == Value::Kind::integer) key += std::to_string(f->value.integer());
    else key += f->value.text();
  }
  return key;
}

}  // namespace

std::string canonical_audit_json(const AuditContent& c) {
  std::string out;
  append_canonical_audit_json(out, c);
  return out;
}

void append_canonical_audit_json(std::string& out, const AuditContent& c) {
  const auto text_or_null = [](std::string& to, const std::string* s) {
    if (s) append_json_string(to, *s);
    else to += "null";
  };
  // Keys in sorted order, as nlohmann::json keeps them.
  out += R"({"action":)";
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
  out += R"(,"seq":)";
  append_json_integer(out, c.seq);
  out += R"(,"table_name":)";
  append_json_string(out, c.table_name);
  if (c.user_id) {
    out += R"(,"user_id":)";
    append_json_integer(out, *c.user_id);
  }
  out += '}';
}

// ---- Writing ----

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
  const TableSchema& s = schemas_.count(table) ? schemas_.at(table) : schema(table);
  std::string columns, marks;
  for (const auto& f : row) {
    const ColumnSchema* c = s.column(f.column);
    if (!c) throw StorageError(fmt::format("table {} has no column {}.", table, f.column));
    if (c->type != "INTEGER" && c->type != "TEXT")
      throw StorageError(fmt::format("column {}.{} has type {}; plumb stores integers and texts only.", table,
                                     f.column, c->type));
    w->columns.emplace_back(f.column);
    w->kinds.push_back(c->type == "INTEGER" ? Value::Kind::integer : Value::Kind::text);
    columns += (columns.empty() ? "" : ", ") + std::string(f.column);
    marks += marks.empty() ? "?" : ", ?";
  }
  std::string values;
  for (std::size_t i = 0; i < rows; ++i) values += fmt::format("{}({})", i ? ", " : "", marks);
  w->insert = std::make_unique<SQLite::Statement>(db_, fmt::format("INSERT INTO {} ({}) VALUES {}", table, columns, values));
  writers_.push_back(std::move(w));
  return *writers_.back();
}

void Recorder::bind_row(Writer& w, const Row& row, std::size_t first_parameter) {
  // The trail records the row as given, not read back: so each value must be stored exactly as given (an
  // integer in an INTEGER column, a text in a TEXT column; no type conversion by SQLite).
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
    // The last guard of the one rule for stored text (core/text_field.hpp): the app checks each field by its
    // name first, so this fires only for a field a new use case forgot to check.
    if (v.kind() == Value::Kind::text) {
      if (const auto fault = text_fault(v.text()))
        throw InputError(fmt::format("the text \"{}\" for {}.{} holds {} at character {}; it cannot be stored.",
                                     shown_on_one_line(v.text()), w.table, row[i].column, fault->what,
                                     fault->character));
    }
    // Texts are bound without a copy: `row` outlives the statement's execution in write_rows.
    if (v.kind() == Value::Kind::integer) w.insert->bind(at, v.integer());
    else w.insert->bindNoCopy(at, v.text());
  }
}

namespace {

bool same_columns(const Row& a, const Row& b) {
  if (a.size() != b.size()) return false;
  for (std::size_t i = 0; i < a.size(); ++i)
    if (a[i].column != b[i].column) return false;
  return true;
}

/// Rows per INSERT statement, and parameters per statement (SQLite's historical limit, below any build's).
constexpr std::size_t rows_per_statement = 64;
constexpr std::size_t max_parameters = 999;

}  // namespace

void Recorder::write_rows(const std::string& table, std::span<const Row* const> rows) {
  // Consecutive rows with the same columns go into one multi-row INSERT: a batch import writes millions of
  // readings, and each statement's execution costs about as much as the rows it carries.
  for (std::size_t from = 0; from < rows.size();) {
    const Row& head = *rows[from];
    const std::size_t most =
        std::clamp<std::size_t>(max_parameters / std::max<std::size_t>(1, head.size()), 1, rows_per_statement);
    std::size_t n = 1;
    while (n < most && from + n < rows.size() && same_columns(*rows[from + n], head)) ++n;
    Writer& w = writer(table, head, n);
    w.insert->reset();  // no clearBindings: every parameter is bound again below
    for (std::size_t i = 0; i < n; ++i) bind_row(w, *rows[from + i], 1 + i * w.columns.size());
    w.insert->exec();
    from += n;
  }
}

void Recorder::write_audits(std::span<const PreparedGroup> groups) {
  constexpr int fields = 12;  // before_json is NULL: records are only ever inserts
  for (std::size_t from = 0; from < groups.size();) {
    const std::size_t n = std::min(rows_per_statement, groups.size() - from);
    auto& insert = audit_inserts_[n];
    if (!insert) {
      std::string values;
      for (std::size_t i = 0; i < n; ++i) {
        if (i > 0) values += ", ";
        values += "(?, ?, ?, ?, ?, ?, ?, NULL, ?, ?, ?, ?, ?)";
      }
      insert = std::make_unique<SQLite::Statement>(
          db_, "INSERT INTO audit_log (seq, at, os_user, actor, action, table_name, row_key, before_json, "
               "after_json, reason, prev_hash, hash, user_id) VALUES " + values);
    }
    insert->reset();  // every parameter is bound again below
    for (std::size_t i = 0; i < n; ++i) {
      // Bound without copies: the groups outlive the execution below.
      const PreparedGroup& g = groups[from + i];
      const int at = static_cast<int>(i) * fields;
      insert->bind(at + 1, g.seq);
      insert->bindNoCopy(at + 2, now_);
      insert->bindNoCopy(at + 3, actor_.os_user);
      insert->bindNoCopy(at + 4, actor_.name);
      insert->bindNoCopy(at + 5, g.action);
      insert->bindNoCopy(at + 6, g.table);
      insert->bindNoCopy(at + 7, g.key);
      insert->bindNoCopy(at + 8, g.after_json);
      if (g.reason.empty()) insert->bind(at + 9);
      else insert->bindNoCopy(at + 9, g.reason);
      insert->bindNoCopy(at + 10, g.prev_hash);
      insert->bindNoCopy(at + 11, g.hash);
      if (actor_.user_id) insert->bind(at + 12, *actor_.user_id);
      else insert->bind(at + 12);
    }
    insert->exec();
    from += n;
  }
}

// ---- The public operations ----

std::int64_t Recorder::insert(const std::string& table, const Row& row, const std::vector<std::string>& key_columns,
                              const std::string& reason) {
  if (batch_) throw StorageError("a single insert cannot be made while a batch is open.");
  const Row* const one = &row;
  write_rows(table, std::span(&one, 1));
  const std::int64_t rowid = db_.getLastInsertRowid();
  PreparedGroup g;
  g.action = "insert";
  g.table = table;
  g.reason = reason;
  append_recorded(schema(table), row, rowid, g.after_json);
  // The key as stored: an integer key the insert left to SQLite is the new rowid.
  Row keyed = row;
  for (const auto& c : schema(table).columns)
    if (c.rowid_alias && std::none_of(row.begin(), row.end(), [&](const Field& f) { return f.column == c.name; }))
      keyed.push_back({c.name, rowid});
  g.key = key_text(keyed, key_columns);
  chain(g);
  write_audits(std::span(&g, 1));
  return rowid;
}

PreparedGroup Recorder::prepare_together(const std::string& reason, const std::function<void(RowGroup&)>& fill) {
  if (!batch_) next_rowid_.clear();  // outside a batch, ids are read afresh for every group
  RowGroup rows(*this);
  fill(rows);
  PreparedGroup g = std::move(rows.group_);
  if (g.inserts.empty()) throw StorageError("an audited group of rows must hold at least one row.");
  g.action = "insert rows";
  g.reason = reason;
  // {"table":{"columns":[...],"rows":[[...],...]},...}: each table's rows in the order they were inserted,
  // the column names once per table (a run's readings would otherwise repeat them in every row).
  std::size_t size = 2;  // one allocation for the whole record, not one per doubling
  for (const auto& b : rows.blocks_) size += b.rows.size() + 32 * (b.given.size() + b.left.size()) + 32;
  g.after_json.reserve(size);
  g.after_json = "{";
  for (const auto& b : rows.blocks_) {
    if (g.after_json.size() > 1) g.after_json += ',';
    append_json_string(g.after_json, b.table);
    g.after_json += R"(:{"columns":[)";
    bool first = true;
    for (const auto& c : b.given) {
      if (!first) g.after_json += ',';
      first = false;
      append_json_string(g.after_json, c);
    }
    for (const ColumnSchema* c : b.left) {
      if (!first) g.after_json += ',';
      first = false;
      append_json_string(g.after_json, c->name);
    }
    g.after_json += R"(],"rows":[)";
    g.after_json += b.rows;
    g.after_json += "]}";
  }
  g.after_json += '}';
  chain(g);
  return g;
}

void Recorder::write(const PreparedGroup& group) { write(std::span(&group, 1)); }

void Recorder::write(std::span<const PreparedGroup> groups) {
  if (groups.empty()) return;
  // Each table's rows of all the groups together, in the tables' order within a group (so that the rows a
  // row refers to, such as a reading's run, are there before it), then the audit records in chain order.
  const auto& tables = groups.front().inserts;
  const bool same_tables = std::all_of(groups.begin(), groups.end(), [&](const PreparedGroup& g) {
    return g.inserts.size() == tables.size() &&
           std::equal(g.inserts.begin(), g.inserts.end(), tables.begin(),
                      [](const PreparedGroup::Insert& a, const PreparedGroup::Insert& b) { return a.table == b.table; });
  });
  if (!same_tables && groups.size() > 1) {
    for (const auto& g : groups) write(std::span(&g, 1));
    return;
  }
  std::vector<const Row*> rows;
  for (std::size_t k = 0; k < tables.size(); ++k) {
    rows.clear();
    for (const auto& g : groups)
      for (const auto& row : g.inserts[k].rows) rows.push_back(&row);
    write_rows(tables[k].table, rows);
  }
  write_audits(groups);
}

void Recorder::insert_together(const std::string& reason, const std::function<void(RowGroup&)>& fill) {
  write(prepare_together(reason, fill));
}

void Recorder::begin_batch(const std::vector<std::string>& tables) {
  if (db_.getHandle() && sqlite3_get_autocommit(db_.getHandle()))
    throw StorageError("a batch must run inside a write transaction.");
  for (const auto& t : tables) {
    schema(t);
    next_rowid_.erase(t);
    next_rowid(t);   // seeds the counter ...
    --next_rowid_[t];  // ... without using an id
  }
  std::tie(tail_seq_, tail_hash_) = chain_tail();
  batch_ = true;
}

void Recorder::end_batch() {
  batch_ = false;
  next_rowid_.clear();
}

void RowGroup::record(const std::string& table, const Row& row, std::int64_t rowid) {
  auto b = std::find_if(blocks_.begin(), blocks_.end(), [&](const Block& x) { return x.table == table; });
  if (b == blocks_.end()) {
    Block fresh;
    fresh.table = table;
    fresh.schema = &rec_.schema(table);
    for (const auto& f : row) fresh.given.emplace_back(f.column);
    for (const auto& c : fresh.schema->columns)
      if (std::find(fresh.given.begin(), fresh.given.end(), c.name) == fresh.given.end()) fresh.left.push_back(&c);
    fresh.rows.reserve(256);
    blocks_.push_back(std::move(fresh));
    b = std::prev(blocks_.end());
  } else {
    b->rows += ',';
  }
  if (row.size() != b->given.size())
    throw StorageError(fmt::format("rows of {} in one group must give the same columns.", table));
  std::string& out = b->rows;
  out += '[';
  for (std::size_t i = 0; i < row.size(); ++i) {
    if (row[i].column != b->given[i])
      throw StorageError(fmt::format("rows of {} in one group must give the same columns.", table));
    if (i > 0) out += ',';
    append_recorded_value(out, row[i].value);
  }
  for (const ColumnSchema* c : b->left) {
    if (!out.empty() && out.back() != '[') out += ',';
    if (c->rowid_alias) append_json_integer(out, rowid);
    else out += c->default_value.dump();
  }
  out += ']';
}

std::int64_t RowGroup::insert(const std::string& table, Row row, const std::vector<std::string>& key_columns) {
  const TableSchema& s = rec_.schema(table);
  std::int64_t rowid = 0;
  for (const auto& c : s.columns)
    if (c.rowid_alias) {
      const auto given = std::find_if(row.begin(), row.end(), [&](const Field& f) { return f.column == c.name; });
      if (given == row.end()) {
        rowid = rec_.next_rowid(table);
        row.insert(row.begin(), Field{c.name, rowid});
      } else if (given->value.kind() == Value::Kind::integer) {
        rowid = given->value.integer();
      }
    }
  record(table, row, rowid);
  if (group_.inserts.empty()) {  // the first row names the group in the trail
    group_.table = table;
    group_.key = key_text(row, key_columns);
  }
  // Consecutive rows of one table stay together (a run's weights), so that groups of the same kind have the
  // same tables in the same order and can be written together.
  if (group_.inserts.empty() || group_.inserts.back().table != table) {
    PreparedGroup::Insert one;  // built in place: a braced list would copy the row (and its long texts)
    one.table = table;
    group_.inserts.push_back(std::move(one));
  }
  group_.inserts.back().rows.push_back(std::move(row));
  return rowid;
}

void RowGroup::insert_rows(const std::string& table, std::vector<Row> rows) {
  if (rows.empty()) return;
  if (group_.inserts.empty()) throw StorageError("a group of rows starts with a single row, whose key names the group.");
  const TableSchema& s = rec_.schema(table);
  for (const auto& c : s.columns)
    if (c.rowid_alias && std::none_of(rows[0].begin(), rows[0].end(), [&](const Field& f) { return f.column == c.name; }))
      throw StorageError(fmt::format("rows of {} written together must give their key {}.", table, c.name));
  for (const auto& row : rows) record(table, row, 0);
  group_.inserts.push_back({table, std::move(rows)});
}

}  // namespace plumb::store
