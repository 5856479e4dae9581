#include "store/audit_trail.hpp"

#include <SQLiteCpp/Statement.h>
#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>
#include <sqlite3.h>

#include <algorithm>
#include <limits>
#include <map>

#include "store/checkpoint_verification.hpp"
#include "store/recorder.hpp"
#include "store/schema_verification.hpp"
#include "store/table_schema.hpp"

namespace plumb::store {
namespace {

using nlohmann::json;

json json_text_or_null(const std::optional<std::string>& s) { return s ? json(*s) : json(); }

std::optional<std::string> optional_column_text(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return c.getString();
}

/// A column's value for messages: strings quoted, long ones shortened.
std::string shown(const json& v) {
  std::string s = v.dump();
  if (s.size() > 80) s = s.substr(0, 60) + fmt::format("... ({} characters)", s.size());
  return s;
}

std::vector<std::string> audited_tables(SQLite::Database& db) {
  SQLite::Statement q(db,
                      "SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' "
                      "AND name NOT IN ('audit_log', 'session_activity', 'checkpoints') ORDER BY name");
  std::vector<std::string> out;
  while (q.executeStep()) out.push_back(q.getColumn(0).getString());
  return out;
}

struct Recorded {
  const AuditRecord* record = nullptr;
  json row;
  bool matched = false;
};

std::string where_recorded(const AuditRecord& r) {
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

AuditProblem field_problem(const TableSchema& info, const Recorded& rec, const json& actual, const std::string& field,
                           const std::string& key) {
  const ColumnSchema* col = info.column(field);
  const json recorded = rec.row.contains(field) ? rec.row[field] : (col ? col->default_value : json());
  const std::string now = actual.contains(field) ? shown(actual[field]) : "absent (the column is gone)";
  // A long text is recorded by its SHA-256: the original cannot be shown, only that it was different.
  const std::string then = recorded.is_object() && recorded.contains("sha256")
                               ? fmt::format("a different text (SHA-256 {}...)",
                                             recorded["sha256"].get<std::string>().substr(0, 16))
                               : shown(recorded);
  AuditProblem p{AuditProblem::Kind::field_mismatch, rec.record->seq, info.name, key, field, rec.record->at, ""};
  p.message = fmt::format("{} {}, {}: field {} is {} in the table but {} was recorded.", p.table, key,
                          where_recorded(*rec.record), field, now, then);
  return p;
}

void check_chain(const std::vector<AuditRecord>& records, AuditVerification& out) {
  std::int64_t expected = 1;
  std::string prev = genesis_hash();
  for (const auto& r : records) {
    if (r.seq != expected) {
      out.problems.push_back({AuditProblem::Kind::missing_record, expected, r.table_name, r.row_key, "", r.at,
                              fmt::format("audit record {} is missing: the trail jumps from record {} to record {} "
                                          "(recorded {}); records were deleted.",
                                          expected, expected - 1, r.seq, r.at)});
    } else if (r.prev_hash != prev) {
      out.problems.push_back(
          {AuditProblem::Kind::broken_link, r.seq, r.table_name, r.row_key, "", r.at,
           fmt::format("audit record {} ({} {}, recorded {} by {}) does not follow record {}: its previous-record hash "
                       "does not match; records were removed, inserted or reordered.",
                       r.seq, r.table_name, r.row_key, r.at, r.actor, r.seq - 1)});
    }
    if (audit_hash(r.prev_hash, r.hashed_content()) != r.hash)
      out.problems.push_back({AuditProblem::Kind::altered_record, r.seq, r.table_name, r.row_key, "", r.at,
                              fmt::format("audit record {} ({} {}, recorded {} by {}) was altered: its content no "
                                          "longer matches its hash.",
                                          r.seq, r.table_name, r.row_key, r.at, r.actor)});
    prev = r.hash;
    expected = r.seq + 1;
  }
  out.records = static_cast<std::int64_t>(records.size());
  out.last_hash = prev;
}

}  // namespace

json AuditRecord::hashed_content() const {
  json j = {{"seq", seq},
          {"at", at},
          {"os_user", os_user},
          {"actor", actor},
          {"action", action},
          {"table_name", table_name},
          {"row_key", row_key},
          {"before_json", json_text_or_null(before_json)},
          {"after_json", json_text_or_null(after_json)},
          {"reason", json_text_or_null(reason)}};
  if (user_id) j["user_id"] = *user_id;  // records from before user accounts hash as they always did
  return j;
}

std::string genesis_hash() { return std::string(64, '0'); }

std::vector<RecordedRow> recorded_rows(const AuditRecord& record) {
  if (!record.after_json) return {};
  json after = json::parse(*record.after_json, nullptr, false);
  if (!after.is_object()) return {};
  if (record.action == "insert") return {{record.table_name, std::move(after)}};
  if (record.action != "insert rows") return {};
  std::vector<RecordedRow> out;
  for (const auto& [table, block] : after.items()) {
    if (!block.is_object() || !block.contains("columns") || !block.contains("rows")) continue;
    const json& columns = block["columns"];
    for (const auto& values : block["rows"]) {
      if (!values.is_array() || values.size() != columns.size()) continue;
      json row = json::object();
      for (std::size_t i = 0; i < columns.size(); ++i) row[columns[i].get<std::string>()] = values[i];
      out.push_back({table, std::move(row)});
    }
  }
  return out;
}

std::vector<AuditRecord> audit_records(SQLite::Database& db) {
  SQLite::Statement q(db,
                      "SELECT seq, at, os_user, actor, action, table_name, row_key, before_json, after_json, reason, "
                      "prev_hash, hash, user_id FROM audit_log ORDER BY seq");
  std::vector<AuditRecord> out;
  while (q.executeStep()) {
    AuditRecord r;
    r.seq = q.getColumn(0).getInt64();
    r.at = q.getColumn(1).getString();
    r.os_user = q.getColumn(2).getString();
    r.actor = q.getColumn(3).getString();
    r.action = q.getColumn(4).getString();
    r.table_name = q.getColumn(5).getString();
    r.row_key = q.getColumn(6).getString();
    r.before_json = optional_column_text(q.getColumn(7));
    r.after_json = optional_column_text(q.getColumn(8));
    r.reason = optional_column_text(q.getColumn(9));
    r.prev_hash = q.getColumn(10).getString();
    r.hash = q.getColumn(11).getString();
    if (!q.getColumn(12).isNull()) r.user_id = q.getColumn(12).getInt64();
    out.push_back(std::move(r));
  }
  return out;
}

AuditVerification verify_audit_trail(SQLite::Database& db, const VerifyOptions& options) {
  // One read transaction: every table, the trail and its checkpoints are read from one snapshot, so a command
  // committing meanwhile in another process is either wholly seen or not at all (no false "written outside plumb").
  std::optional<SQLite::Transaction> snapshot;
  if (sqlite3_get_autocommit(db.getHandle())) {
    snapshot.emplace(db, SQLite::TransactionBehavior::DEFERRED);
    db.execAndGet("SELECT count(*) FROM sqlite_schema");  // a deferred transaction takes its snapshot at the first read
  }
  AuditVerification out;
  out.problems = verify_schema(db, out.schema_objects);
  const auto records = audit_records(db);
  check_chain(records, out);
  verify_checkpoints(db, records, options, out);

  // What the trail says each table holds, by primary key.
  const auto tables = audited_tables(db);
  std::map<std::string, TableSchema> infos;
  for (const auto& t : tables) infos[t] = read_table_schema(db, t);
  std::map<std::string, std::map<std::string, Recorded>> recorded;
  const auto expect = [&](const AuditRecord& r, const std::string& table, json row) {
    const auto info = infos.find(table);
    if (info == infos.end()) {
      out.problems.push_back({AuditProblem::Kind::row_missing, r.seq, table, r.row_key, "", r.at,
                              fmt::format("{} {}, {}: the table {} no longer exists.", table, r.row_key,
                                          where_recorded(r), table)});
      return;
    }
    if (!row.is_object()) return;  // an altered record; the chain check has reported it
    const std::string key = key_text(info->second.key_columns, row);
    auto [it, fresh] = recorded[table].try_emplace(key, Recorded{&r, std::move(row), false});
    if (!fresh)
      out.problems.push_back({AuditProblem::Kind::duplicate_record, r.seq, table, key, "", r.at,
                              fmt::format("{} {}, {}: the same row was already recorded by audit record {}.", table,
                                          key, where_recorded(r), it->second.record->seq)});
  };
  for (const auto& r : records)
    for (auto& [table, row] : recorded_rows(r)) expect(r, table, std::move(row));

  // Every row of every table against the trail.
  struct Unaudited {
    std::string table, key;
    json row;
  };
  std::vector<Unaudited> unaudited;
  for (const auto& t : tables) {
    const TableSchema& info = infos[t];
    ++out.tables;
    SQLite::Statement q(db, fmt::format("SELECT * FROM \"{}\"", t));
    auto& expected = recorded[t];
    while (q.executeStep()) {
      ++out.rows;
      const json actual = row_json(q);
      const std::string key = key_text(info.key_columns, actual);
      const auto it = expected.find(key);
      if (it == expected.end()) {
        unaudited.push_back({t, key, actual});
        continue;
      }
      it->second.matched = true;
      for (const auto& field : differing_columns(info, it->second.row, actual))
        out.problems.push_back(field_problem(info, it->second, actual, field, key));
    }
  }

  // A recorded row that is gone, paired with an unrecorded row that differs from it in one column only,
  // is one changed field (typically a key column); otherwise it is a deleted row.
  for (auto& [table, rows] : recorded) {
    for (auto& [key, rec] : rows) {
      if (rec.matched) continue;
      const TableSchema& info = infos[table];
      auto partner = unaudited.end();
      std::vector<std::string> diff;
      for (auto u = unaudited.begin(); u != unaudited.end(); ++u) {
        if (u->table != table) continue;
        auto d = differing_columns(info, rec.row, u->row);
        if (d.size() == 1) {
          partner = u;
          diff = std::move(d);
          break;
        }
      }
      if (partner != unaudited.end()) {
        out.problems.push_back(field_problem(info, rec, partner->row, diff[0], key));
        unaudited.erase(partner);
        continue;
      }
      out.problems.push_back({AuditProblem::Kind::row_missing, rec.record->seq, table, key, "", rec.record->at,
                              fmt::format("{} {}, {}: the row is missing from the table.", table, key,
                                          where_recorded(*rec.record))});
    }
  }
  for (const auto& u : unaudited)
    out.problems.push_back({AuditProblem::Kind::unaudited_row, 0, u.table, u.key, "", "",
                            fmt::format("{} {} is in the table but no audit record describes it: it was written "
                                        "outside plumb.",
                                        u.table, u.key)});

  // Trail order: the first problem is the earliest record that went wrong; unaudited rows come last.
  // Schema problems come last of all: the changed row is the news, a dropped trigger only how it was done.
  std::stable_sort(out.problems.begin(), out.problems.end(), [](const AuditProblem& a, const AuditProblem& b) {
    const auto order = [](const AuditProblem& p) {
      constexpr auto last = std::numeric_limits<std::int64_t>::max();
      return p.kind == AuditProblem::Kind::schema ? last : p.seq == 0 ? last - 1 : p.seq;
    };
    return order(a) < order(b);
  });
  return out;
}

}  // namespace plumb::store
