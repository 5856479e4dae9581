#pragma once
// What an insider with the database file (but not the lab's key) can do with SQLite alone: drop the append-only
// triggers, change rows, and recompute the whole unkeyed SHA-256 chain from its documented construction
// (doc/audit-trail.md), then put the triggers back, so that the trail is consistent again and the schema unchanged.
// Written here from the documentation, with OpenSSL and nlohmann::json directly, not with plumb's own code.
#include <SQLiteCpp/Database.h>

#include <filesystem>
#include <functional>
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::test {

/// In one transaction: drops every trigger, runs `edit`, recomputes prev_hash and hash of every audit record in
/// seq order, and recreates the triggers as they were.
void insider_rewrite(const std::filesystem::path& db, const std::function<void(SQLite::Database&)>& edit);

/// Changes `column` of the row of `table` whose integer `key_column` is `key`, in the table and in the audit record
/// that describes it (`insert`: after_json is the row; `insert rows`: the row in the table's block of columns and
/// rows), so that table and trail agree again.
void edit_recorded_field(SQLite::Database& db, const std::string& table, const std::string& key_column, long long key,
                         const std::string& column, const nlohmann::json& value);

/// The canonical JSON of an audit record as documented: the fields seq, at, os_user, actor, action, table_name,
/// row_key, before_json, after_json, reason (texts or null) as one JSON object with sorted keys, no spaces.
/// hash = SHA-256 hex of prev_hash + "\n" + that text; the first record's prev_hash is 64 zeros.
std::string documented_audit_hash(const std::string& prev_hash, const std::string& canonical_json);

}  // namespace plumb::test
