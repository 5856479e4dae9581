#pragma once
// Proving the signed checkpoints against the trail: each signature with the lab's public key, each head hash
// against the chain as it stands, no checkpoint missing, no record after the last one, and an exported checkpoint
// (audit verify --since) still there unchanged. This is what catches a trail rewritten with its hashes recomputed.
#include <SQLiteCpp/Database.h>

#include <SQLiteCpp/Statement.h>

#include <cstdint>
#include <string>

#include "store/audit_trail.hpp"

namespace plumb::store {

/// The trail as the checkpoints need it, looked up by position (the n-th record in sequence order) rather than
/// held in memory. When the sequence numbers run 1..n without a gap (the chain check says so), position n is
/// record n; otherwise (records were deleted) positions are counted, which is slow but only ever on a damaged trail.
class TrailPositions {
 public:
  TrailPositions(SQLite::Database& db, std::int64_t records, bool numbered_by_position);
  [[nodiscard]] std::int64_t size() const { return records_; }
  /// The hash of the record at `position` (1-based); the genesis hash at 0.
  std::string hash_at(std::int64_t position);
  struct Named {
    std::string table_name, row_key, at;
  };
  Named record_at(std::int64_t position);

 private:
  SQLite::Statement& lookup(std::int64_t position);
  std::int64_t records_;
  SQLite::Statement query_;
  bool by_seq_;
};

/// Adds the problems found to `out` (and its checkpoint count, last checkpoint and key fingerprint). One pass over
/// the checkpoints in order, each looked up in the trail by its count: constant memory per checkpoint.
void verify_checkpoints(SQLite::Database& db, TrailPositions& trail, const VerifyOptions& options,
                        AuditVerification& out);

}  // namespace plumb::store
