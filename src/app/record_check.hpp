#pragma once
// Recording a check run: validate everything (instrument, weights and their traceability, readings),
// compute the results, judge them, schedule the next check, and write it all in one transaction.
#include <optional>
#include <string>
#include <vector>

#include "core/units.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::app {

struct CheckInput {
  std::string instrument_id;
  std::string procedure;                ///< "repeatability"
  std::vector<std::string> weight_ids;  ///< e.g. {"W100"}
  std::string readings_csv;             ///< the CSV text
  std::string readings_source;          ///< file name for messages
  MassUnit default_unit = MassUnit::g;
  std::string on;                       ///< date performed, YYYY-MM-DD
  std::string operator_name;
  std::optional<std::int64_t> supersedes;  ///< a correction: the run this one replaces
  std::string reason;                      ///< why it replaces it (required with supersedes)
  /// For a batch import: the line of each reading in the import file, so that messages point there.
  std::vector<int> reading_lines;
};

/// Validates, computes and records one check in its own transaction; nothing is written on error.
store::RunRecord record_check(store::Database& db, const store::Actor& actor, const CheckInput& in);
/// The same inside a transaction the caller holds (batch import); returns the new run id.
std::int64_t record_check_in(store::Database& db, store::Recorder& rec, const CheckInput& in);

/// "LAST" or a run number; InputError when there is no such run.
std::int64_t resolve_run(store::Database& db, const std::string& selector);

/// The procedures `check record` knows.
std::vector<std::string> known_procedures();

}  // namespace plumb::app
