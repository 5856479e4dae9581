#include "store/checkpoint_verification.hpp"

#include <SQLiteCpp/Statement.h>
#include <fmt/format.h>

#include "core/errors.hpp"
#include "store/lab_key.hpp"

namespace plumb::store {
namespace {

/// "check_runs id=3, certificates id=2" for the records first..last (1-based), the first three of them.
std::string records_named(TrailPositions& records, std::int64_t first, std::int64_t last) {
  std::string out;
  const std::int64_t shown = std::min<std::int64_t>(last, first + 2);
  for (std::int64_t seq = first; seq <= shown && seq <= records.size(); ++seq) {
    const auto r = records.record_at(seq);
    if (!out.empty()) out += ", ";
    out += fmt::format("{} {}", r.table_name, r.row_key);
  }
  if (last > shown) out += fmt::format(" and {} more", last - shown);
  return out;
}

std::string range_text(std::int64_t first, std::int64_t last) {
  return first == last ? fmt::format("audit record {}", first) : fmt::format("audit records {}-{}", first, last);
}

std::string deleted_text(std::int64_t first, std::int64_t last) {
  return range_text(first, last) + (first == last ? " was" : " were");
}

std::string checkpoint_text(const Checkpoint& c) {
  return fmt::format("checkpoint {} (signed {}, covering {} audit records)", c.number, c.signed_at, c.records);
}

AuditProblem checkpoint_problem(std::int64_t seq, const std::string& at, std::string message) {
  AuditProblem p;
  p.kind = AuditProblem::Kind::checkpoint;
  p.seq = seq;
  p.table = "checkpoints";
  p.recorded_at = at;
  p.message = std::move(message);
  return p;
}

AuditProblem unsigned_problem(std::int64_t seq, const std::string& at, std::string message) {
  AuditProblem p = checkpoint_problem(seq, at, std::move(message));
  p.kind = AuditProblem::Kind::unsigned_records;
  p.table.clear();
  return p;
}

/// The signature of `c` against the trusted key, or against the key it names when none was given.
void check_signature(const Checkpoint& c, const VerifyOptions& options, const std::string& where,
                     AuditVerification& out) {
  const std::int64_t seq = std::max<std::int64_t>(c.records, 1);
  if (options.public_key && c.public_key != *options.public_key) {
    out.problems.push_back(checkpoint_problem(
        seq, c.signed_at,
        fmt::format("{}{} is signed with key {}, not with the lab's key {} ({}): it was not signed by the lab.",
                    checkpoint_text(c), where, key_fingerprint(c.public_key), key_fingerprint(*options.public_key),
                    options.public_key_source)));
    return;
  }
  if (!signature_valid(c.public_key, checkpoint_statement(c), c.signature))
    out.problems.push_back(checkpoint_problem(
        seq, c.signed_at,
        fmt::format("{}{}: its Ed25519 signature does not verify; the checkpoint was altered or forged.",
                    checkpoint_text(c), where)));
}

void check_since(const Checkpoint& kept, const std::optional<Checkpoint>& in_db, TrailPositions& records,
                 const VerifyOptions& options, std::int64_t last_number, AuditVerification& out) {
  const std::string where = fmt::format(" in {}", options.since_source);
  check_signature(kept, options, where, out);
  const std::int64_t trail = records.size();
  const std::int64_t seq = std::max<std::int64_t>(kept.records, 1);
  if (!in_db) {
    out.problems.push_back(checkpoint_problem(
        seq, kept.signed_at,
        fmt::format("{} of {} is not in the database, which ends at checkpoint {} with {} audit records: the "
                    "records after were deleted.",
                    checkpoint_text(kept), options.since_source, last_number, trail)));
  } else if (!(*in_db == kept)) {
    out.problems.push_back(checkpoint_problem(
        seq, kept.signed_at,
        fmt::format("{} of {} differs from checkpoint {} in the database: the checkpoint was replaced.",
                    checkpoint_text(kept), options.since_source, kept.number)));
  }
  if (kept.records > trail)
    out.problems.push_back(checkpoint_problem(
        seq, kept.signed_at,
        fmt::format("{} of {} covers {} audit records, but the trail holds only {}: {} deleted.", checkpoint_text(kept),
                    options.since_source, kept.records, trail, deleted_text(trail + 1, kept.records))));
  else if (records.hash_at(kept.records) != kept.head_hash)
    out.problems.push_back(checkpoint_problem(
        seq, kept.signed_at,
        fmt::format("{} of {}: the trail's audit record {} no longer has the hash it signed; records up to it were "
                    "rewritten.",
                    checkpoint_text(kept), options.since_source, kept.records)));
}

}  // namespace

TrailPositions::TrailPositions(SQLite::Database& db, std::int64_t records, bool numbered_by_position)
    : records_(records),
      query_(db, numbered_by_position
                     ? "SELECT hash, table_name, row_key, at FROM audit_log WHERE seq = ?"
                     : "SELECT hash, table_name, row_key, at FROM audit_log ORDER BY seq LIMIT 1 OFFSET ?"),
      by_seq_(numbered_by_position) {}

SQLite::Statement& TrailPositions::lookup(std::int64_t position) {
  query_.reset();
  query_.bind(1, by_seq_ ? position : position - 1);
  if (!query_.executeStep()) throw StorageError(fmt::format("audit record {} cannot be read back.", position));
  return query_;
}

std::string TrailPositions::hash_at(std::int64_t position) {
  if (position == 0) return genesis_hash();
  return lookup(position).getColumn(0).getString();
}

TrailPositions::Named TrailPositions::record_at(std::int64_t position) {
  auto& q = lookup(position);
  return {q.getColumn(1).getString(), q.getColumn(2).getString(), q.getColumn(3).getString()};
}

void verify_checkpoints(SQLite::Database& db, TrailPositions& records, const VerifyOptions& options,
                        AuditVerification& out) {
  const std::int64_t trail = records.size();
  std::int64_t expected = 1, covered = 0, last_number = 0;
  bool rewritten = false;  // after the first checkpoint that no longer matches, every later one fails too
  std::optional<Checkpoint> since_in_db;
  const bool signed_trail = db.tableExists("checkpoints");  // a database from migration 012 on
  if (signed_trail) {
    SQLite::Statement q(db, fmt::format("SELECT {} FROM checkpoints ORDER BY number", checkpoint_columns));
    while (q.executeStep()) {
      const Checkpoint c = checkpoint_from_row(q);
      ++out.checkpoints;
      last_number = c.number;
      if (options.since && c.number == options.since->number) since_in_db = c;
      const std::int64_t seq = std::max<std::int64_t>(c.records, 1);
      if (c.number != expected)
        out.problems.push_back(checkpoint_problem(
            seq, c.signed_at,
            fmt::format("checkpoint {} is missing: the checkpoints jump from {} to {}; checkpoints were deleted.",
                        expected, expected - 1, c.number)));
      check_signature(c, options, "", out);
      if (c.records < covered) {
        out.problems.push_back(checkpoint_problem(
            seq, c.signed_at,
            fmt::format("{} covers fewer records than the checkpoint before it ({}).", checkpoint_text(c), covered)));
      } else if (c.records > trail) {
        out.problems.push_back(
            checkpoint_problem(seq, c.signed_at,
                               fmt::format("{} covers {} audit records, but the trail holds only {}: {} deleted.",
                                           checkpoint_text(c), c.records, trail, deleted_text(trail + 1, c.records))));
      } else if (!rewritten && records.hash_at(c.records) != c.head_hash) {
        rewritten = true;
        out.problems.push_back(checkpoint_problem(
            seq, c.signed_at,
            fmt::format("{} no longer matches the trail: {} ({}) {} not what it signed; the records were rewritten "
                        "and the hash chain recomputed.",
                        checkpoint_text(c), range_text(covered + 1, std::max(c.records, covered + 1)),
                        records_named(records, covered + 1, c.records), c.records > covered + 1 ? "are" : "is")));
      }
      covered = std::max(covered, c.records);
      expected = c.number + 1;
      out.last_checkpoint = c;
      out.key_fingerprint = key_fingerprint(options.public_key.value_or(c.public_key));
    }
  }
  if (out.checkpoints == 0 && (trail > 0 || signed_trail || options.public_key || options.since)) {
    out.problems.push_back(unsigned_problem(
        1, "",
        trail > 0 ? fmt::format("{} ({}) {} not covered by any signed checkpoint: written without the lab's key, or "
                                "before checkpoints (then sign them with `plumb key create`).",
                                range_text(1, trail), records_named(records, 1, trail), trail == 1 ? "is" : "are")
                  : std::string("the database holds no audit record and no signed checkpoint, but a lab's database "
                                "always has both: its records and checkpoints were deleted.")));
  } else if (covered < trail) {
    out.problems.push_back(unsigned_problem(
        covered + 1, records.record_at(covered + 1).at,
        fmt::format("{} ({}) {} not covered by a signed checkpoint (the last, checkpoint {}, covers {}): written "
                    "outside plumb or without the lab's key.",
                    range_text(covered + 1, trail), records_named(records, covered + 1, trail),
                    trail == covered + 1 ? "is" : "are", last_number, covered)));
  }
  if (options.since) check_since(*options.since, since_in_db, records, options, last_number, out);
}

}  // namespace plumb::store
