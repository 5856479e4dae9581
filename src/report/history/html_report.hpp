#pragma once
// The self-contained HTML history report: one file with inline CSS and inline SVG charts, no scripts,
// no fonts or images fetched from anywhere, so it opens the same on an auditor's laptop offline.
#include <optional>
#include <string>
#include <vector>

#include "core/dates.hpp"
#include "report/history/views.hpp"
#include "report/status/views.hpp"

namespace plumb::report {


struct InstrumentSection {
  std::string id, title, location, status;
  std::vector<std::string> findings;  ///< one sentence each: control chart, drift, interval review
  std::vector<std::string> svg_charts;  ///< as render_chart(..., svg) returns them
  HistoryView history;
};

struct HtmlReport {
  std::string lab_name;
  Date on;
  std::string scope;  ///< "the whole laboratory" or "balance AB-01"
  std::vector<DueItem> due;
  std::vector<InstrumentSection> instruments;
  std::string caution;
};

std::string html_report(const HtmlReport& report);

/// Makes cairo's SVG fit to inline in HTML beside other charts: drops the XML declaration and the
/// namespace declarations (HTML parsing supplies them), and prefixes every id and reference to it with
/// `prefix`, because cairo numbers glyphs and clips alike in every file and ids must be unique in a page.
std::string inline_svg(const std::string& svg, const std::string& prefix);

std::string html_escape(std::string_view s);

}  // namespace plumb::report
