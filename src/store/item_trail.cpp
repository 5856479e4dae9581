#include "store/item_trail.hpp"

#include <SQLiteCpp/Statement.h>
#include <fmt/format.h>

#include <algorithm>

#include "store/table_schema.hpp"

namespace plumb::store {
namespace {

std::string quoted_identifier(const std::string& name) {
  std::string out = "\"";
  for (const char c : name) out += c == '"' ? std::string("\"\"") : std::string(1, c);
  return out + "\"";
}

std::string quoted_literal(const std::string& text) {
  std::string out = "'";
  for (const char c : text) out += c == '\'' ? std::string("''") : std::string(1, c);
  return out + "'";
}

/// The SQL of a row's key as the Recorder writes it in row_key ("col=value,col=value"; SQLite writes an integer
/// as std::to_string does, a text as it is, and a missing value as null).
std::string key_expression(const std::vector<std::string>& key_columns) {
  std::string out;
  for (const auto& k : key_columns) {
    if (!out.empty()) out += " || ',' || ";
    out += quoted_literal(k + "=") + " || coalesce(t." + quoted_identifier(k) + ", 'null')";
  }
  return out;
}

/// What makes a row of this table one of the instrument's (?1), or empty when no row of it can be.
std::string related_condition(const TableSchema& s) {
  std::vector<std::string> any;
  if (s.name == "instruments") any.emplace_back("t.id = ?1");
  if (s.column("instrument_id")) any.emplace_back("t.instrument_id = ?1");
  if (s.column("item_kind") && s.column("item_id")) any.emplace_back("(t.item_kind = 'instrument' AND t.item_id = ?1)");
  if (s.column("run_id")) any.emplace_back("t.run_id IN (SELECT id FROM check_runs WHERE instrument_id = ?1)");
  if (s.column("certificate_id"))
    any.emplace_back(
        "t.certificate_id IN (SELECT c.id FROM certificates c JOIN check_runs r ON r.id = c.run_id "
        "WHERE r.instrument_id = ?1)");
  std::string out;
  for (const auto& a : any) out += (out.empty() ? "" : " OR ") + a;
  return out;
}

}  // namespace

std::vector<std::int64_t> instrument_record_seqs(SQLite::Database& db, const std::string& instrument_id) {
  std::vector<std::string> tables;
  SQLite::Statement list(db,
                         "SELECT name FROM sqlite_schema WHERE type = 'table' AND name NOT LIKE 'sqlite_%' AND name "
                         "<> 'audit_log' ORDER BY name");
  while (list.executeStep()) tables.push_back(list.getColumn(0).getString());
  std::vector<std::int64_t> seqs;
  for (const auto& table : tables) {
    const TableSchema s = read_table_schema(db, table);
    const std::string condition = related_condition(s);
    if (condition.empty() || s.key_columns.empty()) continue;
    // A table whose rows never name a record (a run's readings ride in the run's record) is not looked up row by
    // row: one step in the index says so.
    SQLite::Statement named(db, "SELECT 1 FROM audit_log WHERE table_name = ? LIMIT 1");
    named.bind(1, table);
    if (!named.executeStep()) continue;
    // CROSS JOIN keeps the table outside: its few rows of this instrument, each looked up in the trail's index.
    SQLite::Statement q(
        db, fmt::format("SELECT a.seq FROM {} t CROSS JOIN audit_log a ON a.table_name = {} AND "
                        "a.row_key = {} WHERE {}",
                        quoted_identifier(table), quoted_literal(table), key_expression(s.key_columns), condition));
    q.bind(1, instrument_id);
    while (q.executeStep()) seqs.push_back(q.getColumn(0).getInt64());
  }
  std::sort(seqs.begin(), seqs.end());
  seqs.erase(std::unique(seqs.begin(), seqs.end()), seqs.end());
  return seqs;
}

std::vector<RecordName> record_names_since(SQLite::Database& db, std::int64_t seq) {
  SQLite::Statement q(db, "SELECT seq, table_name, row_key FROM audit_log WHERE seq > ? ORDER BY seq");
  q.bind(1, seq);
  std::vector<RecordName> out;
  while (q.executeStep())
    out.push_back({q.getColumn(0).getInt64(), q.getColumn(1).getString(), q.getColumn(2).getString()});
  return out;
}

std::optional<std::string> record_hash(SQLite::Database& db, std::int64_t seq) {
  SQLite::Statement q(db, "SELECT hash FROM audit_log WHERE seq = ?");
  q.bind(1, seq);
  if (!q.executeStep()) return std::nullopt;
  return q.getColumn(0).getString();
}

std::optional<std::string> run_instrument(SQLite::Database& db, std::int64_t run_id) {
  SQLite::Statement q(db, "SELECT instrument_id FROM check_runs WHERE id = ?");
  q.bind(1, run_id);
  if (!q.executeStep()) return std::nullopt;
  return q.getColumn(0).getString();
}

}  // namespace plumb::store
