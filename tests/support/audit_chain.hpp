#pragma once
// Checks a database's audit trail from the outside, independently of plumb's own code paths except the
// hash function itself: seq runs 1..N without a gap, each prev_hash is the previous row's hash, and each
// hash is SHA-256(prev_hash + "\n" + the record's canonical JSON) (store::audit_hash).
#include <SQLiteCpp/Statement.h>

#include <filesystem>
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::test {

struct AuditCheck {
  long long rows = 0;
  std::string problem;  ///< empty when the chain is consistent
};

AuditCheck check_audit_chain(const std::filesystem::path& db);
/// The record an audit_log row's hash covers, from a statement whose first ten columns are seq, at, os_user, actor,
/// action, table_name, row_key, before_json, after_json, reason and whose column `user_id_column` is user_id (the
/// documented construction, written once for the chain check and the insider's rewrite).
nlohmann::json hashed_audit_record(const SQLite::Statement& q, int user_id_column);

/// The audit records of user accounts (their rows, passwords, events, settings and sessions): what the test helper's
/// log-in adds, so that a test can still count the lab's own records exactly.
long long account_records(const std::filesystem::path& db);
/// The signed checkpoints that cover account records only (the helper's account commands, each signed like any).
long long account_checkpoints(const std::filesystem::path& db);

}  // namespace plumb::test
