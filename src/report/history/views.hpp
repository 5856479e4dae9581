#pragma once
// What the history, control-chart, drift and interval-review outputs show, as plain data filled by the
// app layer from the database and the trend statistics. The renderings (trend_text.hpp, the HTML report)
// read only these, so they never touch the database.
#include <cstdint>
#include <memory>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "checks/procedure.hpp"
#include "core/dates.hpp"
#include "stats/control_chart.hpp"
#include "stats/drift.hpp"
#include "stats/interval_review.hpp"
#include "stats/observation.hpp"

namespace plumb::report {

struct QuantityView {
  std::string key;         ///< "bias"
  std::string label;       ///< "Bias at 100 g"
  std::string unit;        ///< "mg"
  std::string uncertainty_basis;
  stats::ToleranceLimits tolerance;
  std::string tolerance_basis;
  bool non_negative = false;  ///< an SD, CV or minimum weight: charts never draw a negative axis
};

/// One check run as a row of the history table; values in the columns' units, absent where not carried.
struct HistoryRow {
  std::int64_t run_id = 0;
  Date date;
  checks::Procedure procedure = checks::Procedure::repeatability;
  std::string operator_name;
  std::string verdict;
  std::optional<Date> next_due;
  std::optional<std::int64_t> supersedes;
  std::optional<std::int64_t> superseded_by;
  std::optional<std::string> void_reason;  ///< set when the run was voided (entered in error)
  /// A current run counts in trends, reviews and due dates: neither corrected away nor void.
  [[nodiscard]] bool current() const { return !superseded_by && !void_reason; }
  std::vector<std::optional<double>> values;  ///< one per column
  std::vector<std::optional<double>> uncertainties;
  /// As stored with the run; shared with the history it was read from (app::RunHistory), not copied: a page of
  /// hundreds of runs makes several views of one history. Null when the view was made without it.
  std::shared_ptr<const nlohmann::json> results;
};

struct HistoryView {
  std::string instrument_id;
  std::string instrument_title;
  std::optional<Date> from, to;  ///< the period asked for, if any
  std::vector<QuantityView> columns;
  std::vector<HistoryRow> rows;
};

/// The results of one quantity that the trend statistics use: current runs only (a superseded run is
/// replaced by the run that corrects it), oldest first.
struct SeriesView {
  std::string instrument_id;
  std::string instrument_title;
  QuantityView quantity;
  std::vector<stats::Observation> points;
  std::vector<std::int64_t> run_ids;  ///< one per point
  std::size_t superseded_left_out = 0;
  std::size_t void_left_out = 0;
};

struct ControlChartView {
  SeriesView series;
  stats::ControlChart chart;
};

struct DriftView {
  SeriesView series;
  stats::DriftResult drift;
};

struct IntervalReviewView {
  std::string instrument_id;
  std::string instrument_title;
  Interval current;
  stats::IntervalRecommendation staircase;
  std::optional<stats::IntervalRecommendation> control_chart;
  stats::IntervalRecommendation recommended;                   ///< the more cautious of the two
  std::string combination;                                     ///< how the two were combined, a sentence
  std::string quantity_label;
};

}  // namespace plumb::report
