#pragma once
// The audit records that concern one instrument, found through the index audit_log_by_row (table_name, row_key)
// instead of a walk over the whole trail: the instrument's own rows, its runs and their certificates are read from
// their tables (each by its own index), and each row's key is looked up in the trail. A page of an instrument
// costs a few index look-ups per run, whatever the size of the lab.
#include <SQLiteCpp/Database.h>

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "store/audit_trail.hpp"

namespace plumb::store {

/// Sequence numbers, ascending, of the records describing a row of `instrument_id`: the instruments row, every
/// row naming it (instrument_id, or item_kind 'instrument' and item_id), every row of one of its runs (run_id)
/// and of one of their certificates (certificate_id). A record counts when such a row is the one that names it
/// in the trail (table_name, row_key): the first row of its group, which for a run is the run and for a
/// certificate event the event.
std::vector<std::int64_t> instrument_record_seqs(SQLite::Database& db, const std::string& instrument_id);

/// What names a record in the trail: its table and the key of its first row.
struct RecordName {
  std::int64_t seq = 0;
  std::string table;
  std::string key;
};

/// The names of the records after `seq`, in order (what changed since a view was computed at `seq`).
std::vector<RecordName> record_names_since(SQLite::Database& db, std::int64_t seq);

/// The hash of record `seq`, none when there is no such record.
std::optional<std::string> record_hash(SQLite::Database& db, std::int64_t seq);

/// The instrument of run `run_id`, none when there is no such run.
std::optional<std::string> run_instrument(SQLite::Database& db, std::int64_t run_id);

}  // namespace plumb::store
