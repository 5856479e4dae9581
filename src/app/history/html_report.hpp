#pragma once
// The HTML history report of the whole lab or one instrument: status and due list, then per instrument
// its findings (control chart, drift, interval review), charts and history table. Read-only.
#include <filesystem>
#include <optional>
#include <string>

#include "core/dates.hpp"
#include "report/history/html_report.hpp"
#include "store/database.hpp"

namespace plumb::app {

struct HistoryReportRequest {
  std::filesystem::path output;  ///< FILE.html
  std::optional<std::string> instrument;
  Date on;  ///< the date the status and due list refer to
};

report::HtmlReport history_report(store::Database& db, const HistoryReportRequest& request);

/// Builds and writes the report; InputError for a bad path or unknown instrument, StorageError on write.
report::HtmlReport write_history_report(store::Database& db, const HistoryReportRequest& request);

}  // namespace plumb::app
