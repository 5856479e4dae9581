#pragma once
// What needs attention: instruments and reference weights that are overdue, due within a window,
// or out of service after a failed check.
#include <array>
#include <map>
#include <string>
#include <string_view>
#include <vector>

#include "core/dates.hpp"
#include "report/status/views.hpp"
#include "store/database.hpp"

namespace plumb::app {

/// Items overdue, out of service, or due within `within_days` of `on`; with `everything`, all items.
/// Sorted: out of service first, then by days left.
/// Retired items come only with `everything`, with status "retired" and no due date.
std::vector<report::DueItem> due_items(store::Database& db, Date on, int within_days, bool everything = false);

/// The words every output (due, summary, lists, history, the HTML report, show pages) uses for where an
/// instrument or weight stands, the one that matters most first.
inline constexpr std::array<std::string_view, 5> standings{"retired", "out of service", "overdue", "due", "in date"};
/// "Due" means due within this many days wherever no window is asked for (summary, lists, reports, show pages),
/// the default of `plumb due --within`.
inline constexpr int default_due_window_days = 14;
/// Position in `standings` (0 matters most).
int standing_rank(std::string_view status);
/// Key of an item in standings_on: "instrument:BAL-A", "weight:W100".
inline std::string standing_key(std::string_view kind, std::string_view id) {
  return std::string(kind) + ":" + std::string(id);
}
/// Every item's one standing on `on`: the due line that matters most (a calibrated balance has two, its weekly
/// check and its calibration).
std::map<std::string, report::DueItem> standings_on(store::Database& db, Date on, int within_days);
/// Instrument id -> its standing on `on` (default window), for the registry lists.
std::map<std::string, std::string> instrument_standings(store::Database& db, Date on);

}  // namespace plumb::app
