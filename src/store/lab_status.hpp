#pragma once
// The latest result of every instrument in one set-based query, visited row by row: the due list and
// the lab summary must stay fast and small on thousands of instruments with millions of readings, so
// nothing here loads readings or holds the whole lab in memory.
#include <SQLiteCpp/Database.h>

#include <functional>
#include <optional>
#include <string>

#include "checks/procedure.hpp"
#include "checks/verdict.hpp"
#include "core/dates.hpp"

namespace plumb::store {

struct LatestResult {
  std::int64_t run_id = 0;
  checks::Procedure procedure = checks::Procedure::repeatability;
  Date performed_on;
  std::string operator_name;
  Verdict verdict = Verdict::pass;
  std::optional<Date> next_due;
  std::optional<double> bias_g;  ///< from the stored results, when the procedure has one
  std::optional<double> sd_g;
  /// A pipette check: the systematic error farthest from zero and the largest CV over its test volumes and
  /// channels, in % (ISO 8655), the figures a reviewer must watch.
  std::optional<double> systematic_error_pct;
  std::optional<double> cv_pct;
};

struct InstrumentStatus {
  std::string id;
  std::string kind;
  std::string location;
  std::string check_every;
  Date created_on;
  std::optional<std::string> readability_g;  ///< a balance's d, exact decimal grams ("0.0001")
  std::optional<LatestResult> latest;  ///< the latest run not superseded, by date then run number
};

/// Visits every instrument (of `kind`, or all when empty) in id order with its latest result; with `only_id`, that
/// one instrument (by the instruments' key, so a page of one instrument does not walk the lab).
void for_each_instrument_status(SQLite::Database& db, const std::string& kind,
                                const std::function<void(const InstrumentStatus&)>& visit,
                                const std::string& only_id = "");

}  // namespace plumb::store
