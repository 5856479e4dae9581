#pragma once
// Proving the signed checkpoints against the trail: each signature with the lab's public key, each head hash
// against the chain as it stands, no checkpoint missing, no record after the last one, and an exported checkpoint
// (audit verify --since) still there unchanged. This is what catches a trail rewritten with its hashes recomputed.
#include <SQLiteCpp/Database.h>

#include <vector>

#include "store/audit_trail.hpp"

namespace plumb::store {

/// Adds the problems found to `out` (and its checkpoint count, last checkpoint and key fingerprint). One pass over
/// the checkpoints in order, each looked up in `records` by its count: constant memory per checkpoint.
void verify_checkpoints(SQLite::Database& db, const std::vector<AuditRecord>& records, const VerifyOptions& options,
                        AuditVerification& out);

}  // namespace plumb::store
