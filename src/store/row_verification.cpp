#include "store/row_verification.hpp"

#include <SQLiteCpp/Statement.h>
#include <fmt/format.h>
#include <sqlite3.h>

#include <algorithm>
#include <unordered_map>
#include <unordered_set>

#include "core/errors.hpp"
#include "store/raw_statement.hpp"
#include "store/recorder.hpp"
#include "store/table_schema.hpp"

namespace plumb::store {
namespace {

using nlohmann::json;

/// A column's value for messages: strings quoted, long ones shortened.
std::string shown_value(const json& v) {
  std::string s = v.dump();
  if (s.size() > 80) s = s.substr(0, 60) + fmt::format("... ({} characters)", s.size());
  return s;
}

std::string where_recorded(const RecordNote& r) {
  return fmt::format("recorded {} by {} (audit record {})", r.at, r.actor, r.seq);
}

/// Columns in which a table row differs from a recorded row (defaults filled in for unmentioned columns).
std::vector<std::string> differing_columns(const TableSchema& info, const json& recorded, const json& actual) {
  std::vector<std::string> out;
  for (const auto& c : info.columns) {
    const json expected = recorded.contains(c.name) ? recorded[c.name] : c.default_value;
    if (!matches_recorded(expected, actual[c.name])) out.push_back(c.name);
  }
  for (const auto& [name, _] : recorded.items())
    if (!actual.contains(name)) out.push_back(name);
  return out;
}

AuditProblem field_problem(const TableSchema& info, const RecordNote& rec, const json& recorded_row, const json& actual,
                           const std::string& field, const std::string& key) {
  const ColumnSchema* col = info.column(field);
  const json recorded = recorded_row.contains(field) ? recorded_row[field] : (col ? col->default_value : json());
  const std::string now = actual.contains(field) ? shown_value(actual[field]) : "absent (the column is gone)";
  // A long text is recorded by its SHA-256: the original cannot be shown, only that it was different.
  const std::string then =
      recorded.is_object() && recorded.contains("sha256")
          ? fmt::format("a different text (SHA-256 {}...)", recorded["sha256"].get<std::string>().substr(0, 16))
          : shown_value(recorded);
  AuditProblem p{AuditProblem::Kind::field_mismatch, rec.seq, info.name, key, field, rec.at, ""};
  p.message = fmt::format("{} {}, {}: field {} is {} in the table but {} was recorded.", p.table, key,
                          where_recorded(rec), field, now, then);
  return p;
}

/// A stored value as store::row_json gives it.
json stored_json(sqlite3_stmt* q, int i) {
  switch (sqlite3_column_type(q, i)) {
    case SQLITE_NULL:
      return nullptr;
    case SQLITE_INTEGER:
      return static_cast<std::int64_t>(sqlite3_column_int64(q, i));
    case SQLITE_FLOAT:
      return sqlite3_column_double(q, i);
    case SQLITE_TEXT:
      return std::string(reinterpret_cast<const char*>(sqlite3_column_text(q, i)),
                         static_cast<std::size_t>(sqlite3_column_bytes(q, i)));
    default: {
      const void* blob = sqlite3_column_blob(q, i);
      return "blob:" + sha256_hex(std::string_view(static_cast<const char*>(blob),
                                                   static_cast<std::size_t>(sqlite3_column_bytes(q, i))));
    }
  }
}

std::string_view stored_text(sqlite3_stmt* q, int i) {
  return column_text(q, i);
}

/// Whether a stored value is certainly what was recorded. False also when unsure: the caller then compares the
/// two as JSON documents (store::matches_recorded), which is the rule; this only spares the common case that.
bool surely_matches(const RecordedValue& recorded, sqlite3_stmt* q, int i) {
  const int type = sqlite3_column_type(q, i);
  switch (recorded.kind) {
    case RecordedValue::Kind::null:
      return type == SQLITE_NULL;
    case RecordedValue::Kind::integer:
      return type == SQLITE_INTEGER && sqlite3_column_int64(q, i) == recorded.integer;
    case RecordedValue::Kind::text:
      return type == SQLITE_TEXT && stored_text(q, i) == recorded.text;
    case RecordedValue::Kind::digest: {
      if (type != SQLITE_TEXT) return false;
      const auto text = stored_text(q, i);
      return text.size() > long_text_bytes && sha256_hex(text) == recorded.text;
    }
    case RecordedValue::Kind::other:
      return false;
  }
  return false;
}

/// One part of a key as store::key_text writes it: a text unquoted, anything else as JSON.
void append_key_part(std::string& key, const RecordedValue& v) {
  switch (v.kind) {
    case RecordedValue::Kind::text:
      key += v.text;
      break;
    case RecordedValue::Kind::integer:
      key += fmt::format_int(v.integer).c_str();
      break;
    case RecordedValue::Kind::null:
      key += "null";
      break;
    default:
      key += v.to_json().dump();
      break;
  }
}

void append_stored_key_part(std::string& key, sqlite3_stmt* q, int i) {
  switch (sqlite3_column_type(q, i)) {
    case SQLITE_TEXT:
      key += stored_text(q, i);
      break;
    case SQLITE_INTEGER:
      key += fmt::format_int(sqlite3_column_int64(q, i)).c_str();
      break;
    case SQLITE_NULL:
      key += "null";
      break;
    default: {
      const json v = stored_json(q, i);
      key += v.is_string() ? v.get<std::string>() : v.dump();
    }
  }
}

}  // namespace

/// One table: its schema, a cursor in rowid order, and what was found out of place.
struct RowVerification::TableWalk {
  TableSchema info;
  std::vector<RecordedValue> defaults;  ///< per schema column
  std::vector<int> key_columns;         ///< schema index of each key column
  std::unique_ptr<RawStatement> scan;   ///< SELECT rowid, * ... ORDER BY rowid (or SELECT * for no rowid)
  std::unique_ptr<RawStatement> find;   ///< the row with a given key
  int offset = 1;                       ///< index of the first table column in scan's and find's rows
  bool has_row = false;
  std::int64_t rowid = 0;
  std::string key;  ///< the key text of the cursor's row
  std::int64_t rows = 0;

  struct Stored {
    std::string key;
    json row;
  };
  std::map<std::int64_t, Stored> pending;  ///< rows the cursor passed that no record has described yet, by rowid
  std::unordered_map<std::string, std::int64_t> pending_by_key;
  std::int64_t next_synthetic_rowid = 0;  ///< a table without rowids has everything pending

  struct Missing {
    RecordNote record;
    std::string key;
    json row;
  };
  std::vector<Missing> missing;                                  ///< recorded rows the table does not hold
  std::unordered_map<std::string, std::int64_t> missing_by_key;  ///< -> the seq that recorded it

  std::unordered_set<std::string> matched_aside;   ///< a table without rowids: keys matched from `pending`
  std::unordered_set<std::int64_t> matched_ahead;  ///< rows compared before the cursor reached them, by rowid
  std::string key_buffer;

  [[nodiscard]] json cursor_json(sqlite3_stmt* q) const {
    json j = json::object();
    for (int i = offset; i < sqlite3_column_count(q); ++i) j[sqlite3_column_name(q, i)] = stored_json(q, i);
    return j;
  }

  void cursor_key(sqlite3_stmt* q, std::string& out) const {
    out.clear();
    for (std::size_t k = 0; k < info.key_columns.size(); ++k) {
      if (k > 0) out += ',';
      out += info.key_columns[k];
      out += '=';
      if (key_columns[k] < 0)
        out += '?';
      else
        append_stored_key_part(out, q, key_columns[k] + offset);
    }
  }

  void advance() {
    for (;;) {
      has_row = scan->step();
      if (!has_row) return;
      ++rows;
      sqlite3_stmt* q = scan->get();
      rowid = offset ? sqlite3_column_int64(q, 0) : next_synthetic_rowid++;
      if (const auto done = matched_ahead.find(rowid); done != matched_ahead.end()) {
        matched_ahead.erase(done);  // compared already, out of order
        continue;
      }
      cursor_key(q, key);
      return;
    }
  }

  /// Keeps the cursor's row aside and moves on.
  void set_aside() {
    pending_by_key.emplace(key, rowid);
    pending.emplace(rowid, Stored{key, cursor_json(scan->get())});
    advance();
  }
};

RowVerification::RowVerification(SQLite::Database& db) : db_(db) {
  SQLite::Statement q(db,
                      "SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' "
                      "AND name NOT IN ('audit_log', 'session_activity', 'checkpoints') ORDER BY name");
  while (q.executeStep()) {
    const std::string name = q.getColumn(0).getString();
    auto w = std::make_unique<TableWalk>();
    w->info = read_table_schema(db, name);
    for (const auto& c : w->info.columns) w->defaults.push_back(recorded_value(c.default_value));
    std::string where;
    for (const auto& k : w->info.key_columns) {
      const auto it = std::find_if(w->info.columns.begin(), w->info.columns.end(),
                                   [&](const ColumnSchema& c) { return c.name == k; });
      w->key_columns.push_back(it == w->info.columns.end() ? -1 : static_cast<int>(it - w->info.columns.begin()));
      where += fmt::format("{}\"{}\" IS ?", where.empty() ? "" : " AND ", k);
    }
    try {
      w->scan = std::make_unique<RawStatement>(db, fmt::format("SELECT rowid, * FROM \"{}\" ORDER BY rowid", name));
      if (!where.empty())
        w->find = std::make_unique<RawStatement>(db, fmt::format("SELECT rowid, * FROM \"{}\" WHERE {}", name, where));
    } catch (const StorageError&) {
      // A table without rowids (plumb creates none): read whole and matched by key from memory.
      w->offset = 0;
      w->find.reset();
      w->scan = std::make_unique<RawStatement>(db, fmt::format("SELECT * FROM \"{}\"", name));
    }
    w->advance();
    if (w->offset == 0)
      while (w->has_row) w->set_aside();
    tables_.emplace(name, std::move(w));
  }
}

RowVerification::~RowVerification() = default;

void RowVerification::duplicate(const RecordNote& record, const std::string& table, const std::string& key,
                                std::int64_t first_seq) {
  AuditProblem p{AuditProblem::Kind::duplicate_record, record.seq, table, key, "", record.at, ""};
  if (first_seq > 0) {
    p.message = fmt::format("{} {}, {}: the same row was already recorded by audit record {}.", table, key,
                            where_recorded(record), first_seq);
  } else {
    unresolved_.push_back({record, table, key, problems_.size()});
  }
  problems_.push_back(std::move(p));
}

void RowVerification::check(const RecordNote& record, const RecordedBlocks& blocks) {
  std::vector<int> to_block;  // per schema column: the block's column, or -1
  for (std::size_t b = 0; b < blocks.size(); ++b) {
    const RecordedBlock& block = blocks[b];
    const auto found = tables_.find(block.table);
    if (found == tables_.end()) {
      for (std::size_t r = 0; r < block.row_count; ++r)
        problems_.push_back({AuditProblem::Kind::row_missing, record.seq, block.table, record.row_key, "", record.at,
                             fmt::format("{} {}, {}: the table {} no longer exists.", block.table, record.row_key,
                                         where_recorded(record), block.table)});
      continue;
    }
    TableWalk& w = *found->second;
    const auto& columns = w.info.columns;
    to_block.assign(columns.size(), -1);
    bool every_column_known = true;
    for (std::size_t c = 0; c < block.column_count; ++c) {
      const auto it = std::find_if(columns.begin(), columns.end(),
                                   [&](const ColumnSchema& s) { return s.name == block.columns[c]; });
      if (it == columns.end())
        every_column_known = false;
      else
        to_block[static_cast<std::size_t>(it - columns.begin())] = static_cast<int>(c);
    }
    for (std::size_t r = 0; r < block.row_count; ++r) {
      std::string& key = w.key_buffer;
      key.clear();
      bool key_given = true;
      for (std::size_t k = 0; k < w.info.key_columns.size(); ++k) {
        if (k > 0) key += ',';
        key += w.info.key_columns[k];
        key += '=';
        const int s = w.key_columns[k];
        const int c = s < 0 ? -1 : to_block[static_cast<std::size_t>(s)];
        if (c < 0) {
          key += '?';
          key_given = false;
        } else {
          append_key_part(key, block.value(r, static_cast<std::size_t>(c)));
        }
      }
      const auto compare_documents = [&](const json& actual) {
        const json recorded = block.row_json(r);
        for (const auto& field : differing_columns(w.info, recorded, actual))
          problems_.push_back(field_problem(w.info, record, recorded, actual, field, key));
      };
      const auto compare_row = [&](sqlite3_stmt* q) {
        bool same = every_column_known;
        for (std::size_t s = 0; same && s < columns.size(); ++s) {
          const int c = to_block[s];
          const RecordedValue& expected = c < 0 ? w.defaults[s] : block.value(r, static_cast<std::size_t>(c));
          same = surely_matches(expected, q, static_cast<int>(s) + w.offset);
        }
        if (!same) compare_documents(w.cursor_json(q));
      };
      const auto compare_cursor = [&] {
        compare_row(w.scan->get());
        w.advance();
      };

      if (w.has_row && w.key == key) {
        compare_cursor();
        continue;
      }
      if (const auto p = w.pending_by_key.find(key); p != w.pending_by_key.end()) {
        const auto stored = w.pending.find(p->second);
        compare_documents(stored->second.row);
        if (w.offset == 0) w.matched_aside.insert(key);
        w.pending.erase(stored);
        w.pending_by_key.erase(p);
        continue;
      }
      // Out of the trail's order: where is the row with this key?
      std::optional<std::int64_t> at;
      if (w.find && key_given) {
        RawStatement& f = *w.find;
        f.reset();
        sqlite3_stmt* q = f.get();
        for (std::size_t k = 0; k < w.key_columns.size(); ++k) {
          const RecordedValue& v =
              block.value(r, static_cast<std::size_t>(to_block[static_cast<std::size_t>(w.key_columns[k])]));
          const int param = static_cast<int>(k) + 1;
          if (v.kind == RecordedValue::Kind::integer)
            sqlite3_bind_int64(q, param, v.integer);
          else if (v.kind == RecordedValue::Kind::text)
            sqlite3_bind_text(q, param, v.text.data(), static_cast<int>(v.text.size()), SQLITE_TRANSIENT);
          else
            sqlite3_bind_null(q, param);
        }
        bool compared = false;
        if (f.step()) {
          std::string found_key;
          w.cursor_key(q, found_key);
          if (found_key == key) at = sqlite3_column_int64(q, 0);
          if (at && w.has_row && *at > w.rowid && w.matched_ahead.count(*at) == 0) {
            // Further on. A few rows before it are set aside (a row changed or added in place stops the cursor
            // there); a row farther on (deleted and written again, say) is compared where it is, and skipped
            // when the cursor reaches it.
            for (int n = 0; n < 16 && w.has_row && w.rowid < *at; ++n) w.set_aside();
            if (w.has_row && w.rowid == *at) {
              compare_cursor();
            } else {
              compare_row(q);
              w.matched_ahead.insert(*at);
            }
            compared = true;
          }
        }
        f.reset();
        if (compared) continue;
      }
      if (at || w.matched_aside.count(key) > 0) {  // passed already and not set aside: an earlier record described it
        duplicate(record, w.info.name, key, 0);
        continue;
      }
      if (const auto m = w.missing_by_key.find(key); m != w.missing_by_key.end()) {
        duplicate(record, w.info.name, key, m->second);
        continue;
      }
      w.missing_by_key.emplace(key, record.seq);
      w.missing.push_back({record, key, block.row_json(r)});
    }
  }
}

void RowVerification::resolve_duplicates() {
  if (unresolved_.empty()) return;
  // The first record of each duplicated row, found in one more pass over the trail (only on a damaged trail).
  std::map<std::pair<std::string, std::string>, std::int64_t> first;
  for (const auto& d : unresolved_) first.emplace(std::make_pair(d.table, d.key), 0);
  SQLite::Statement q(db_, "SELECT seq, action, table_name, after_json FROM audit_log ORDER BY seq");
  RecordedBlocks blocks;
  std::string key;
  while (q.executeStep()) {
    blocks.read(q.getColumn(1).getText(), q.getColumn(2).getText(), q.getColumn(3).getText());
    for (std::size_t b = 0; b < blocks.size(); ++b) {
      const RecordedBlock& block = blocks[b];
      const auto w = tables_.find(block.table);
      if (w == tables_.end()) continue;
      for (std::size_t r = 0; r < block.row_count; ++r) {
        const json row = block.row_json(r);
        const auto f = first.find({block.table, key_text(w->second->info.key_columns, row)});
        if (f != first.end() && f->second == 0) f->second = q.getColumn(0).getInt64();
      }
    }
  }
  for (const auto& d : unresolved_)
    problems_[d.problem].message = fmt::format("{} {}, {}: the same row was already recorded by audit record {}.",
                                               d.table, d.key, where_recorded(d.record), first[{d.table, d.key}]);
}

void RowVerification::finish(AuditVerification& out) {
  resolve_duplicates();
  for (auto& [name, w] : tables_) {
    while (w->has_row) w->set_aside();
    ++out.tables;
    out.rows += w->rows;
  }
  // A recorded row that is gone, paired with an unrecorded row that differs from it in one column only,
  // is one changed field (typically a key column); otherwise it is a deleted row.
  for (auto& [name, w] : tables_) {
    std::sort(w->missing.begin(), w->missing.end(),
              [](const TableWalk::Missing& a, const TableWalk::Missing& b) { return a.key < b.key; });
    for (const auto& m : w->missing) {
      bool paired = false;
      for (auto u = w->pending.begin(); u != w->pending.end(); ++u) {
        const auto diff = differing_columns(w->info, m.row, u->second.row);
        if (diff.size() != 1) continue;
        problems_.push_back(field_problem(w->info, m.record, m.row, u->second.row, diff[0], m.key));
        w->pending.erase(u);
        paired = true;
        break;
      }
      if (!paired)
        problems_.push_back(
            {AuditProblem::Kind::row_missing, m.record.seq, name, m.key, "", m.record.at,
             fmt::format("{} {}, {}: the row is missing from the table.", name, m.key, where_recorded(m.record))});
    }
  }
  for (auto& [name, w] : tables_)
    for (const auto& [rowid, u] : w->pending)
      problems_.push_back({AuditProblem::Kind::unaudited_row, 0, name, u.key, "", "",
                           fmt::format("{} {} is in the table but no audit record describes it: it was written "
                                       "outside plumb.",
                                       name, u.key)});
  for (auto& p : problems_) out.problems.push_back(std::move(p));
  problems_.clear();
}

}  // namespace plumb::store
