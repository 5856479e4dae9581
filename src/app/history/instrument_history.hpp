#pragma once
// Reading an instrument's history from the database for the trend commands, the HTML report and the
// certificates: every run (superseded ones marked) as a table, and one quantity as a series of results.
// Read-only: nothing here writes.
#include <optional>
#include <string>
#include <vector>

#include "app/history/quantities.hpp"
#include "report/history/views.hpp"
#include "store/database.hpp"

namespace plumb::app {

struct Period {
  std::optional<Date> from, to;  ///< inclusive; absent = open
};

/// Parses --from / --to (either may be absent); InputError when a date is malformed or from > to.
Period parse_period(const std::optional<std::string>& from, const std::optional<std::string>& to);

/// The instrument, or InputError "instrument "X" is not registered."
InstrumentInfo find_instrument(store::Database& db, const std::string& id);

/// An instrument's runs read once (oldest first) with the certificate of each run's first reference weight: one page
/// or report shows its table, its series and its reviews from one reading of its history.
struct RunHistory {
  InstrumentInfo instrument;
  /// Shared, so that the views made from it point into its runs' results instead of copying them.
  std::shared_ptr<const std::vector<store::RunRecord>> runs;
  std::vector<std::optional<store::WeightCalibration>> first_weights;  ///< one per run
};
RunHistory read_run_history(store::Database& db, const InstrumentInfo& instrument);

/// Every run in the period, oldest first, with every quantity of the instrument's kind as a column.
report::HistoryView history_view(store::Database& db, const InstrumentInfo& instrument, const Period& period);

/// The same with only the given quantities as columns (`history --quantity`).
report::HistoryView history_view(store::Database& db, const InstrumentInfo& instrument, const Period& period,
                                 const std::vector<const HistoryQuantity*>& quantities);

/// The same from a history read once.
report::HistoryView history_view(const RunHistory& history, const Period& period);
report::HistoryView history_view(const RunHistory& history, const Period& period,
                                 const std::vector<const HistoryQuantity*>& quantities);

/// InputError unless some run of the instrument (in any period) carries `quantity`: a pipette's test volume never
/// tested, or a channel it does not have, is refused rather than shown as an empty column. `asked` is --quantity.
void require_results(store::Database& db, const InstrumentInfo& instrument, const HistoryQuantity& quantity,
                     const std::string& asked);

/// The current (not superseded) results of one quantity in the period, with the tolerance that applies now.
report::SeriesView series_view(store::Database& db, const InstrumentInfo& instrument, const HistoryQuantity& quantity,
                               const Period& period);
report::SeriesView series_view(const RunHistory& history, const HistoryQuantity& quantity, const Period& period);

}  // namespace plumb::app
