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
/// The due lines of one instrument (`everything` as above; no weights): the same lines, in the same order, as
/// due_items gives for it, without reading the rest of the lab.
std::vector<report::DueItem> instrument_due_items(store::Database& db, const std::string& instrument_id, Date on,
                                                  int within_days, bool everything = true);

/// The lines of due_items before they are ordered: every instrument's (or only `only_id`'s) in id order, each
/// instrument's lines together, then (for the whole lab) every weight's; retired ones marked. With
/// order_due_items they are exactly due_items (the overview keeps them so, to replace one instrument's lines).
std::vector<report::DueItem> due_lines_in_id_order(store::Database& db, Date on, int within_days,
                                                   const std::string& only_id = "");
/// due_items' order: without `everything` drops what is in date or retired; out of service first, retired last,
/// then by days left (stable).
void order_due_items(std::vector<report::DueItem>& items, bool everything);

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
