#pragma once
// Electronic signatures (21 CFR Part 11 11.50, 11.70): a signature names one record by table and key and holds
// the SHA-256 of exactly what was signed, that record's content as its audit record holds it (after_json). So a
// signature moved to another record, or a record changed after it was signed, no longer matches
// (store/signature_check.hpp).
#include <SQLiteCpp/Database.h>

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "store/recorder.hpp"

namespace plumb::store {

struct SignatureRecord {
  std::int64_t id = 0;
  std::int64_t user_id = 0;
  std::string printed_name;
  std::string signed_at;  ///< UTC
  std::string meaning;
  std::string table_name;
  std::string row_key;
  std::string signed_sha256;
};

/// What a signature of `table` `row_key` signs: the content its audit record holds; none when no audit record
/// describes that row.
std::optional<std::string> signed_content(SQLite::Database& db, const std::string& table, const std::string& row_key);

/// Signs the record `table` `row_key` (written earlier in this transaction or before) as the recorder's user with
/// `meaning`. StorageError when the record is not in the trail or the recorder has no user.
SignatureRecord add_signature(Recorder& rec, SQLite::Database& db, const std::string& table, const std::string& row_key,
                              const std::string& meaning);

/// The signatures of one record, in order.
std::vector<SignatureRecord> signatures_of(SQLite::Database& db, const std::string& table, const std::string& row_key);
/// Every signature, in order.
std::vector<SignatureRecord> all_signatures(SQLite::Database& db);

}  // namespace plumb::store
