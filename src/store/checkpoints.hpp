#pragma once
// Signed checkpoints of the audit trail (schema/012_checkpoints.sql): after each command, the number of audit
// records, the hash of the last one and the time, signed with the lab's Ed25519 key. A checkpoint exported to a
// file (`audit checkpoint export`) is the same object in JSON.
#include <SQLiteCpp/Database.h>

#include <cstdint>
#include <filesystem>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>

#include "store/lab_key.hpp"

namespace plumb::store {

struct Checkpoint {
  std::int64_t number = 0;
  std::int64_t records = 0;  ///< audit records 1..records are covered
  std::string head_hash;     ///< hash of audit record `records` (the genesis hash for none)
  std::string signed_at;     ///< UTC
  std::string covers;        ///< "command", or "records before checkpoints" (the first of an older database)
  std::string public_key;    ///< raw Ed25519, hex
  std::string signature;     ///< hex

  friend bool operator==(const Checkpoint&, const Checkpoint&) = default;
};

/// The exact text a checkpoint's signature covers: one line per field, in a fixed order (doc/audit-trail.md).
std::string checkpoint_statement(const Checkpoint& c);

/// Signs and appends a checkpoint covering the trail as it stands, inside the caller's write transaction; nothing
/// when the last checkpoint covers the whole trail already. `first_of_command` is the command's first audit record
/// (0: none): the first checkpoint of a trail that has records before it says it covers records written before
/// checkpoints. Returns the checkpoint written.
std::optional<Checkpoint> write_checkpoint(SQLite::Database& db, const LabKey& key, std::int64_t first_of_command);

/// The last checkpoint; none when there is none (or the table does not exist: a copy from before 012).
std::optional<Checkpoint> latest_checkpoint(SQLite::Database& db);
/// The first checkpoint that covers audit record `seq`.
std::optional<Checkpoint> checkpoint_covering(SQLite::Database& db, std::int64_t seq);
/// The first checkpoint that covers the audit record of the row `row_key` ("id=3") of `table`.
std::optional<Checkpoint> checkpoint_covering_row(SQLite::Database& db, const std::string& table,
                                                  const std::string& row_key);
/// The current row of a `SELECT number, records, head_hash, signed_at, covers, public_key, signature`.
Checkpoint checkpoint_from_row(SQLite::Statement& q);
inline constexpr const char* checkpoint_columns =
    "number, records, head_hash, signed_at, covers, public_key, signature";

/// A checkpoint as exported: {"plumb_checkpoint": 1, "number": ..., ...}.
nlohmann::json checkpoint_json(const Checkpoint& c);
/// Reads an exported checkpoint; InputError naming `option`, the file and the field that is wrong.
Checkpoint read_checkpoint_file(const std::filesystem::path& file, const std::string& option);

}  // namespace plumb::store
