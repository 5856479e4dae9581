#include "store/audit_trail.hpp"

#include <SQLiteCpp/Statement.h>
#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>
#include <sqlite3.h>

#include <algorithm>
#include <iterator>
#include <limits>

#include "store/checkpoint_verification.hpp"
#include "store/raw_statement.hpp"
#include "store/recorded_blocks.hpp"
#include "store/recorder.hpp"
#include "store/row_verification.hpp"
#include "store/schema_verification.hpp"
#include "store/table_schema.hpp"

namespace plumb::store {
namespace {

using nlohmann::json;

json json_text_or_null(const std::optional<std::string>& s) {
  return s ? json(*s) : json();
}

std::optional<std::string> optional_column_text(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return c.getString();
}

std::string_view column_view(sqlite3_stmt* q, int i) {
  return column_text(q, i);
}

/// The chain, one record at a time: each record's place, link and hash.
class ChainCheck {
 public:
  explicit ChainCheck(AuditVerification& out) : out_(out), prev_(genesis_hash()) {}

  void check(const AuditContent& r, std::string_view prev_hash, std::string_view hash) {
    const auto where = [&] {
      return fmt::format("({} {}, recorded {} by {})", r.table_name, r.row_key, r.at, r.actor);
    };
    if (r.seq != expected_) {
      out_.problems.push_back({AuditProblem::Kind::missing_record, expected_, std::string(r.table_name),
                               std::string(r.row_key), "", std::string(r.at),
                               fmt::format("audit record {} is missing: the trail jumps from record {} to record {} "
                                           "(recorded {}); records were deleted.",
                                           expected_, expected_ - 1, r.seq, r.at)});
    } else if (prev_hash != prev_) {
      out_.problems.push_back(
          {AuditProblem::Kind::broken_link, r.seq, std::string(r.table_name), std::string(r.row_key), "",
           std::string(r.at),
           fmt::format("audit record {} {} does not follow record {}: its previous-record hash does not match; "
                       "records were removed, inserted or reordered.",
                       r.seq, where(), r.seq - 1)});
    }
    hashed_.assign(prev_hash);
    hashed_ += '\n';
    append_canonical_audit_json(hashed_, r);
    if (sha256_hex(hashed_) != hash)
      out_.problems.push_back(
          {AuditProblem::Kind::altered_record, r.seq, std::string(r.table_name), std::string(r.row_key), "",
           std::string(r.at),
           fmt::format("audit record {} {} was altered: its content no longer matches its hash.", r.seq, where())});
    prev_.assign(hash);
    expected_ = r.seq + 1;
    ++walked_;
    if (r.seq != walked_) numbered_by_position_ = false;
  }

  [[nodiscard]] std::int64_t walked() const { return walked_; }
  [[nodiscard]] const std::string& last_hash() const { return prev_; }
  /// Record n is the n-th record: no gap in the sequence numbers.
  [[nodiscard]] bool numbered_by_position() const { return numbered_by_position_; }

 private:
  AuditVerification& out_;
  std::int64_t expected_ = 1, walked_ = 0;
  bool numbered_by_position_ = true;
  std::string prev_, hashed_;
};

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

std::string genesis_hash() {
  return std::string(64, '0');
}

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

namespace {

std::vector<AuditRecord> audit_records_of(SQLite::Statement& q) {
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

constexpr const char* audit_record_columns =
    "SELECT seq, at, os_user, actor, action, table_name, row_key, before_json, after_json, reason, prev_hash, hash, "
    "user_id FROM audit_log ";

}  // namespace

std::vector<AuditRecord> audit_records(SQLite::Database& db) {
  SQLite::Statement q(db, std::string(audit_record_columns) + "ORDER BY seq");
  return audit_records_of(q);
}

std::int64_t audit_record_count(SQLite::Database& db) {
  return db.execAndGet("SELECT count(*) FROM audit_log").getInt64();
}

std::vector<AuditRecord> audit_records_by_seq(SQLite::Database& db, const std::vector<std::int64_t>& seqs) {
  std::vector<AuditRecord> out;
  // A few hundred numbers to a statement: integers written by us, so the list is safe to write into the SQL.
  constexpr std::size_t per_statement = 500;
  for (std::size_t from = 0; from < seqs.size(); from += per_statement) {
    std::string list;
    for (std::size_t i = from; i < std::min(seqs.size(), from + per_statement); ++i)
      list += (list.empty() ? "" : ",") + std::to_string(seqs[i]);
    SQLite::Statement q(db, std::string(audit_record_columns) + "WHERE seq IN (" + list + ") ORDER BY seq");
    auto part = audit_records_of(q);
    std::move(part.begin(), part.end(), std::back_inserter(out));
  }
  std::sort(out.begin(), out.end(), [](const AuditRecord& a, const AuditRecord& b) { return a.seq < b.seq; });
  return out;
}

std::pair<std::int64_t, std::string> trail_tail(SQLite::Database& db) {
  SQLite::Statement q(db, "SELECT seq, hash FROM audit_log ORDER BY seq DESC LIMIT 1");
  if (!q.executeStep()) return {0, genesis_hash()};
  return {q.getColumn(0).getInt64(), q.getColumn(1).getString()};
}

std::vector<AuditRecord> latest_audit_records(SQLite::Database& db, std::int64_t limit) {
  SQLite::Statement q(db, std::string(audit_record_columns) + "ORDER BY seq DESC LIMIT ?");
  q.bind(1, limit);
  auto out = audit_records_of(q);
  std::reverse(out.begin(), out.end());
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

  // One pass over the trail: each record's link and hash, and the rows it describes against the tables, which
  // are walked alongside (store/row_verification). Nothing is kept from one record to the next but the chain's
  // tail and what was found out of place.
  ChainCheck chain(out);
  RowVerification rows(db);
  RecordedBlocks blocks;
  RawStatement q(db,
                 "SELECT seq, at, os_user, actor, action, table_name, row_key, before_json, after_json, reason, "
                 "prev_hash, hash, user_id FROM audit_log ORDER BY seq");
  sqlite3_stmt* const row = q.get();
  std::string before, after, reason;
  RecordNote note;
  while (q.step()) {
    AuditContent r;
    r.seq = sqlite3_column_int64(row, 0);
    r.at = column_view(row, 1);
    r.os_user = column_view(row, 2);
    r.actor = column_view(row, 3);
    r.action = column_view(row, 4);
    r.table_name = column_view(row, 5);
    r.row_key = column_view(row, 6);
    const auto optional_text = [&](int i, std::string& buffer) -> const std::string* {
      if (sqlite3_column_type(row, i) == SQLITE_NULL) return nullptr;
      buffer.assign(column_view(row, i));
      return &buffer;
    };
    r.before_json = optional_text(7, before);
    r.after_json = optional_text(8, after);
    r.reason = optional_text(9, reason);
    if (sqlite3_column_type(row, 12) != SQLITE_NULL) r.user_id = sqlite3_column_int64(row, 12);
    chain.check(r, column_view(row, 10), column_view(row, 11));
    blocks.read(r.action, r.table_name, r.after_json ? std::string_view(*r.after_json) : std::string_view());
    if (blocks.size() == 0) continue;
    note.seq = r.seq;
    note.at.assign(r.at);
    note.actor.assign(r.actor);
    note.row_key.assign(r.row_key);
    rows.check(note, blocks);
  }
  out.records = chain.walked();
  out.last_hash = chain.last_hash();

  TrailPositions positions(db, chain.walked(), chain.numbered_by_position());
  verify_checkpoints(db, positions, options, out);
  rows.finish(out);

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
