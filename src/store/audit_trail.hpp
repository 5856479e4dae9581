#pragma once
// Reading the audit trail and proving it: every record chains to the one before it by SHA-256, and every
// row of every table is exactly what the trail says was inserted.
#include <SQLiteCpp/Database.h>

#include <cstdint>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "store/checkpoints.hpp"

namespace plumb::store {

struct AuditRecord {
  std::int64_t seq = 0;
  std::string at;  ///< UTC
  std::string os_user;
  std::string actor;
  std::string action;
  std::string table_name;
  std::string row_key;
  std::optional<std::string> before_json;
  std::optional<std::string> after_json;
  std::optional<std::string> reason;
  std::string prev_hash;
  std::string hash;
  std::optional<std::int64_t> user_id;  ///< the account that wrote it; none before user accounts

  /// The fields the hash covers, as the Recorder wrote them (everything but the two hashes).
  [[nodiscard]] nlohmann::json hashed_content() const;
};

/// A row as an audit record describes it.
struct RecordedRow {
  std::string table;
  nlohmann::json row;  ///< column -> value (a long text as {"sha256": hex})
};

/// The rows an audit record describes: one for "insert" (after_json is the row); for "insert rows"
/// (after_json is {"table": {"columns": [...], "rows": [[...], ...]}, ...}) every row of every table, in
/// order. Empty when after_json is not what the action says (an altered record: the chain reports it).
std::vector<RecordedRow> recorded_rows(const AuditRecord& record);

/// The whole trail in sequence order.
std::vector<AuditRecord> audit_records(SQLite::Database& db);
/// The last `limit` records of the trail, in order (a page that shows the newest reads no more than it shows).
std::vector<AuditRecord> latest_audit_records(SQLite::Database& db, std::int64_t limit);
std::int64_t audit_record_count(SQLite::Database& db);
/// The records with these sequence numbers, in sequence order (those of one instrument: store/item_trail.hpp).
std::vector<AuditRecord> audit_records_by_seq(SQLite::Database& db, const std::vector<std::int64_t>& seqs);
/// The last record's sequence number and hash ({0, genesis} for an empty trail): every write appends a record, so
/// this pair changes with every change to the records, and a view computed from the database can be kept under it.
std::pair<std::int64_t, std::string> trail_tail(SQLite::Database& db);

/// The hash a trail starts from (there is no record before the first).
std::string genesis_hash();

struct AuditProblem {
  enum class Kind {
    missing_record,     ///< a gap in the sequence numbers: audit records were deleted
    broken_link,        ///< prev_hash is not the hash of the record before: removed, inserted or reordered
    altered_record,     ///< the record's content does not match its own hash
    field_mismatch,     ///< a table row differs from what the trail recorded
    row_missing,        ///< the trail recorded a row that the table no longer has
    unaudited_row,      ///< a table row that no audit record describes
    duplicate_record,   ///< two audit records describe the same row
    checkpoint,         ///< a signed checkpoint that is missing, forged, or no longer matches the trail
    unsigned_records,   ///< audit records after the last signed checkpoint
    schema,             ///< a table, column, trigger or index that the migrations do not create (or one gone)
    signature_mismatch  ///< a signature no longer matches the record it names (store/signature_check.hpp)
  };
  Kind kind = Kind::altered_record;
  std::int64_t seq = 0;  ///< the audit record concerned (0 for an unaudited row)
  std::string table;
  std::string key;    ///< primary key, e.g. "run_id=3,seq=2"
  std::string field;  ///< the column, for a field mismatch
  std::string recorded_at;
  std::string message;  ///< one sentence naming table, key, field and when it was recorded
};

struct AuditVerification {
  std::int64_t records = 0;      ///< audit records walked
  std::int64_t rows = 0;         ///< table rows compared with the trail
  std::int64_t tables = 0;       ///< tables compared
  std::string last_hash;         ///< hash of the last record (genesis when the trail is empty)
  std::int64_t checkpoints = 0;  ///< signed checkpoints proved
  std::optional<Checkpoint> last_checkpoint;
  std::string key_fingerprint;         ///< of the key that signed them (store::key_fingerprint)
  std::int64_t schema_objects = 0;     ///< tables, indexes and triggers compared with the migrations
  std::vector<AuditProblem> problems;  ///< in trail order; the first is the first thing that went wrong

  [[nodiscard]] bool ok() const { return problems.empty(); }
};

struct VerifyOptions {
  /// The lab's public key (hex) from outside the database; none: each checkpoint is checked with the key it names,
  /// which proves it unaltered but not who signed it.
  std::optional<std::string> public_key;
  std::string public_key_source;  ///< for messages, e.g. "the public key lab.pub"
  /// An exported checkpoint whose history must still be there unchanged (audit verify --since).
  std::optional<Checkpoint> since;
  std::string since_source;
};

/// In one read transaction (one consistent snapshot, whatever other processes write meanwhile): compares the schema
/// with what the compiled-in migrations create, walks the chain, proves every signed checkpoint against it, and
/// compares every column of every row of every table (but the trail and its checkpoints) with the row the trail
/// recorded. Reads only.
AuditVerification verify_audit_trail(SQLite::Database& db, const VerifyOptions& options = {});

}  // namespace plumb::store
