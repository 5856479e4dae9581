#pragma once
// What the due list and the lab summary show, as plain data the app layer fills (app/status) and the
// renderings here, the HTML report and the web pages read.
#include <optional>
#include <string>

#include "core/dates.hpp"
#include "store/lab_status.hpp"

namespace plumb::report {

struct DueItem {
  std::string kind;  ///< "balance" (weekly checks), "calibration" (of a balance), "pipette", "weight"
  std::string id;
  std::string location;
  std::string status;  ///< "overdue", "due", "out of service", "in date"
  std::optional<Date> due_on;
  std::optional<int> days_left;  ///< negative when overdue
  std::string detail;
};

struct SummaryRow {
  store::InstrumentStatus instrument;
  std::string status;            ///< "out of service", "overdue", "in date" (as of the reference date)
  std::optional<Date> next_due;  ///< absent when out of service
  std::optional<int> days_left;  ///< negative when overdue
};

}  // namespace plumb::report
