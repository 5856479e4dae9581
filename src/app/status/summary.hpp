#pragma once
// The lab at a glance: every instrument with its latest result (verdict, bias, repeatability SD) and when
// it is next due. Rows are handed to the caller one at a time, so a lab of thousands of instruments is
// printed without being held in memory.
#include <functional>
#include <optional>
#include <string>

#include "core/dates.hpp"
#include "store/database.hpp"
#include "report/status/views.hpp"

namespace plumb::app {


/// Visits every instrument in id order as of `on`.
void lab_summary(store::Database& db, Date on, const std::function<void(const report::SummaryRow&)>& visit);

}  // namespace plumb::app
