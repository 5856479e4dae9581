#pragma once
// The part of `audit verify` that concerns signatures: each signature must still match the record it names.
#include <SQLiteCpp/Database.h>

#include <vector>

#include "store/audit_trail.hpp"

namespace plumb::store {

/// One problem per signature whose record is gone from the trail or whose signed SHA-256 no longer matches that
/// record's content (the signature was moved to another record, or what was signed was changed).
std::vector<AuditProblem> signature_problems(SQLite::Database& db);

}  // namespace plumb::store
