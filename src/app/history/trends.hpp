#pragma once
// The trend use cases behind `plumb history`, `control-chart`, `drift` and `interval-review`: read the
// history, run the statistics, optionally draw the chart. Read-only on the database; the only thing
// written is the chart file the user asked for.
#include <filesystem>
#include <optional>
#include <string>

#include "app/history/instrument_history.hpp"
#include "report/chart/chart.hpp"
#include "report/history/charts.hpp"
#include "report/history/views.hpp"

namespace plumb::app {

struct TrendRequest {
  std::string instrument;
  std::string quantity = "bias";
  Period period;
  std::optional<std::filesystem::path> chart;  ///< .svg, .png or .pdf
  bool full_scale = false;  ///< --full-scale: draw the whole tolerance band even when it flattens the data
};

/// Every run as a table; the chart (if asked for) shows `quantity`, superseded results drawn apart.
report::HistoryView history(store::Database& db, const TrendRequest& request);

struct ControlChartRequest {
  TrendRequest trend;
  std::optional<std::size_t> baseline_count;        ///< --baseline N: the first N results
  std::optional<std::string> baseline_from, baseline_to;  ///< or the results dated in this period
};
report::ControlChartView control_chart(store::Database& db, const ControlChartRequest& request);

report::DriftView drift(store::Database& db, const TrendRequest& request);

/// Both published methods on the instrument's verdicts and on `quantity`; the shorter interval wins.
report::IntervalReviewView interval_review(store::Database& db, const TrendRequest& request);
/// The same from a history read once.
report::IntervalReviewView interval_review(const RunHistory& history, const HistoryQuantity& quantity,
                                           const Period& period);

/// Checks the chart path before any work: a known extension and an existing folder (InputError otherwise).
void require_chart_path(const std::optional<std::filesystem::path>& chart);

/// What a chart marks besides the values, read from the instrument's history: which results failed, the void runs'
/// results of the quantity, each adjustment (a current calibration run stored with `adjusted` true, i.e. with an
/// as-left stage), and the index of the first result of the latest adjustment period (the adjusting run's own
/// as-left result and everything after it), which is the only part a drift line is fitted to.
report::HistoryChartMarks chart_marks(const report::SeriesView& s, const report::HistoryView& all);

/// The drift of `s` fitted within the latest adjustment period only (`marks.fitted_from` on).
stats::DriftResult drift_in_period(const report::SeriesView& s, const report::HistoryChartMarks& marks);

/// The chart specs the commands draw, shared with the HTML report.
report::ChartSpec history_chart(const report::SeriesView& current, const report::HistoryView& all);
report::ChartSpec control_chart_spec(const report::ControlChartView& v, const report::HistoryChartMarks& marks = {});
report::ChartSpec drift_chart_spec(const report::DriftView& v, const report::HistoryChartMarks& marks = {});

}  // namespace plumb::app
