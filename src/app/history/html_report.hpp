#pragma once
// The HTML history report of the whole lab or one instrument, read-only on the database.
//
// One instrument: one page FILE.html (status and due list, findings, charts, history). The whole lab: FILE.html
// is the overview (status, due list, one row per instrument with a link) and FILE-instruments/ holds one page
// per instrument. Each page is written as soon as it is computed and then dropped, so memory stays that of one
// instrument at any lab size. Every file is created owner-only; a command that fails removes what it wrote.
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

struct HistoryReportWritten {
  std::size_t instruments = 0;
  std::filesystem::path overview;
  std::optional<std::filesystem::path> folder;  ///< the instrument pages of a whole-lab report
};

/// One instrument's findings, charts and history as its report page shows them (also for the web pages).
report::InstrumentSection instrument_section(store::Database& db, const std::string& instrument_id, Date on);

/// The folder of a whole-lab report's instrument pages: FILE-instruments beside FILE.html.
std::filesystem::path instrument_pages_folder(const std::filesystem::path& overview);

/// Builds and writes the report; InputError for a bad path or unknown instrument, StorageError on write.
HistoryReportWritten write_history_report(store::Database& db, const HistoryReportRequest& request);

}  // namespace plumb::app
