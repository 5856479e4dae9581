#pragma once
// What needs attention: instruments and reference weights that are overdue, due within a window,
// or out of service after a failed check.
#include <optional>
#include <string>
#include <vector>

#include "core/dates.hpp"
#include "store/database.hpp"

namespace plumb::app {

struct DueItem {
  std::string kind;      ///< "balance" (weekly checks), "calibration" (of a balance), "pipette", "weight"
  std::string id;
  std::string location;
  std::string status;    ///< "overdue", "due", "out of service", "in date"
  std::optional<Date> due_on;
  std::optional<int> days_left;  ///< negative when overdue
  std::string detail;
};

/// Items overdue, out of service, or due within `within_days` of `on`; with `everything`, all items.
/// Sorted: out of service first, then by days left.
std::vector<DueItem> due_items(store::Database& db, Date on, int within_days, bool everything = false);

}  // namespace plumb::app
