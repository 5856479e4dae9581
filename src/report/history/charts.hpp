#pragma once
// ChartSpecs built from the trend statistics, so that the history command, the HTML report and the
// certificates draw the same control and drift charts. Pure: statistics results in, a spec out.
#include <optional>
#include <span>
#include <string>
#include <utility>
#include <vector>

#include "report/chart/chart.hpp"
#include "stats/control_chart.hpp"
#include "stats/drift.hpp"

namespace plumb::report {

struct HistoryChartLabels {
  std::string instrument;  ///< "Balance B-07 (analytical, 220 g)"
  std::string quantity;    ///< "Bias at 100 g"
  std::string unit;        ///< "mg"
  bool non_negative = false;  ///< SD, CV, minimum weight: the y axis starts at zero at the lowest
};

/// What the history knows beyond the values: which results failed, which runs were voided, when the instrument
/// was adjusted, and (drift) from which result on the trend was fitted.
struct HistoryChartMarks {
  std::vector<ChartPoint::Outcome> outcomes;              ///< one per result drawn (pass / failed); empty: all passes
  std::vector<stats::Observation> void_runs;              ///< void runs' results, drawn apart with their own marker
  std::vector<std::pair<Date, std::string>> adjustments;  ///< date and label of each adjustment in the period
  /// Drift: the fit used only the results from this index on (those after the latest adjustment).
  std::optional<std::size_t> fitted_from;
};

/// The caution shown under every history chart (instruments may weigh medicines, clinical or food samples).
extern const char* const history_chart_caution;

/// Results with their U as error bars, the tolerance band, the zero line, and the drift line with its
/// equation, R^2 and RMSE and prediction band only when the slope is significant (p < 0.05); the part
/// after the last check, up to the projected date, is dashed and labelled extrapolated.
ChartSpec drift_chart_spec(std::span<const stats::Observation> history, const stats::DriftResult& drift,
                           const stats::ToleranceLimits& tolerance, const HistoryChartLabels& labels,
                           const HistoryChartMarks& marks = {});

/// Every result with its U as error bars, the tolerance band and the zero line, no trend; results that a
/// correction superseded are drawn as a second series without error bars, so nothing is hidden.
ChartSpec history_chart_spec(std::span<const stats::Observation> current,
                             std::span<const stats::Observation> superseded, const stats::ToleranceLimits& tolerance,
                             const HistoryChartLabels& labels, const HistoryChartMarks& marks = {});

/// Results with centre line and 3-sigma control limits, the baseline shaded and labelled; points named by a Western
/// Electric flag are ringed and every flag's explanation is listed under the chart.
ChartSpec control_chart_spec(std::span<const stats::Observation> history, const stats::ControlChart& chart,
                             const stats::ToleranceLimits& tolerance, const HistoryChartLabels& labels,
                             const HistoryChartMarks& marks = {});

}  // namespace plumb::report
