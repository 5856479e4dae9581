#pragma once
// The HTML history report, self-contained: inline CSS and inline SVG charts with real text, no scripts, no fonts
// or images fetched from anywhere, so it opens the same on an auditor's laptop offline.
//
// Two shapes (doc/charts.md): one instrument is one page; the whole lab is an overview page (status, due list,
// one row per instrument with a link) and one page per instrument in a folder beside it. The renderers append
// to a string that the caller writes out and clears, page by page, so a lab of any size is written as it goes.
#include <optional>
#include <string>
#include <vector>

#include "core/dates.hpp"
#include "report/chart/chart.hpp"
#include "report/history/views.hpp"
#include "report/status/views.hpp"

namespace plumb::report {

struct InstrumentSection {
  std::string id, title, location, status;
  std::vector<std::string> findings;  ///< one sentence each: control chart, drift, interval review
  std::vector<ChartSpec> charts;      ///< drawn as inline SVG where the page is written
  HistoryView history;
};

/// What every page of one report shares.
struct ReportHeading {
  std::string lab_name;
  Date on;
  std::string scope;  ///< "the whole laboratory" or "instrument AB-01"
  std::string caution;
};

/// One row of the overview: an instrument and the page that holds it (a path relative to the overview).
struct OverviewRow {
  std::string id, title, location, status, page;
  std::size_t runs = 0;
  std::string first_finding;
};

/// A page for one instrument: with `due` (a one-instrument report) or with a link back to `overview_href`.
void append_instrument_page(std::string& out, const ReportHeading& heading, const InstrumentSection& instrument,
                            const std::vector<DueItem>* due, const std::string& overview_href);

/// The overview page of the whole lab, in three parts so that rows can be written as they are known.
void append_overview_start(std::string& out, const ReportHeading& heading, const std::vector<DueItem>& due);
void append_overview_row(std::string& out, const OverviewRow& row);
void append_overview_end(std::string& out, const ReportHeading& heading, std::size_t instruments);

std::string html_escape(std::string_view s);

}  // namespace plumb::report
