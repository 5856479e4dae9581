#pragma once
// The schema is part of what `audit verify` proves: every table, column, index and trigger of the database against
// what plumb's own migrations create. Someone who drops the append-only triggers, or adds a column, a table or a
// trigger of their own, is named.
#include <SQLiteCpp/Database.h>

#include <vector>

#include "store/audit_trail.hpp"

namespace plumb::store {

/// Applies the compiled-in migrations up to the database's schema version to an empty in-memory database and
/// compares the two: objects (sqlite_schema: type, name, table and SQL) and each table's columns (pragma
/// table_info). Returns one problem per difference and sets `objects` to the number of objects compared.
std::vector<AuditProblem> verify_schema(SQLite::Database& db, std::int64_t& objects);

}  // namespace plumb::store
