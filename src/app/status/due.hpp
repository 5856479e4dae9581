#pragma once
// What needs attention: instruments and reference weights that are overdue, due within a window,
// or out of service after a failed check.
#include <vector>

#include "core/dates.hpp"
#include "report/status/views.hpp"
#include "store/database.hpp"

namespace plumb::app {

/// Items overdue, out of service, or due within `within_days` of `on`; with `everything`, all items.
/// Sorted: out of service first, then by days left.
std::vector<report::DueItem> due_items(store::Database& db, Date on, int within_days, bool everything = false);

}  // namespace plumb::app
