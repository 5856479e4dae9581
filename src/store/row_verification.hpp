#pragma once
// The second half of `audit verify`: every row of every table against the row the trail recorded, without
// holding either side in memory. The trail is walked in sequence order and each table in rowid order (the order
// the Recorder inserted its rows, which is the trail's order), merge-join style: the next recorded row of a table
// is, in a database nobody changed, the next row of that table. A row out of that order is looked up by its
// primary key: a few rows before it are kept aside until a record describes them (or reported as written outside
// plumb at the end), a row far ahead is compared where it is. Memory is what one record needs plus what was found
// out of place.
#include <SQLiteCpp/Database.h>

#include <cstdint>
#include <map>
#include <memory>
#include <string>
#include <vector>

#include "store/audit_trail.hpp"
#include "store/recorded_blocks.hpp"

namespace plumb::store {

/// Which audit record a recorded row comes from, for messages.
struct RecordNote {
  std::int64_t seq = 0;
  std::string at, actor, row_key;
};

class RowVerification {
 public:
  /// Opens one cursor per audited table (every table but the trail, its checkpoints and session activity).
  explicit RowVerification(SQLite::Database& db);
  ~RowVerification();
  RowVerification(const RowVerification&) = delete;
  RowVerification& operator=(const RowVerification&) = delete;

  /// Compares the rows one audit record describes with the tables.
  void check(const RecordNote& record, const RecordedBlocks& blocks);
  /// Reads the rest of every table and adds, in trail order as store::verify_audit_trail lists them: each
  /// differing field, each row missing (or changed in its key), each row no record describes; and the rows and
  /// tables compared.
  void finish(AuditVerification& out);

  struct TableWalk;

 private:
  void duplicate(const RecordNote& record, const std::string& table, const std::string& key, std::int64_t first_seq);
  void resolve_duplicates();

  SQLite::Database& db_;
  std::map<std::string, std::unique_ptr<TableWalk>> tables_;
  std::vector<AuditProblem> problems_;  ///< found while walking the trail
  struct Duplicate {
    RecordNote record;
    std::string table, key;
    std::size_t problem = 0;  ///< index in problems_ whose message still needs the first record's number
  };
  std::vector<Duplicate> unresolved_;
};

}  // namespace plumb::store
