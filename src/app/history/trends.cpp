#include "app/history/trends.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cstdint>
#include <map>
#include <span>

#include "core/errors.hpp"
#include "report/history/charts.hpp"

namespace plumb::app {
namespace {

report::HistoryChartLabels labels_of(const report::SeriesView& s) {
  return {s.instrument_title, s.quantity.label, s.quantity.unit, s.quantity.non_negative};
}

// Every chart states how its error bars were found and where its limits come from.
void add_basis_notes(report::ChartSpec& spec, const report::SeriesView& s) {
  std::vector<std::string> basis = {"Error bars: " + s.quantity.uncertainty_basis + ".",
                                    "Tolerance: " + s.quantity.tolerance_basis + "."};
  spec.notes.insert(spec.notes.begin(), basis.begin(), basis.end());
}

void write_if_asked(report::ChartSpec spec, const TrendRequest& r) {
  spec.full_scale = r.full_scale;
  if (r.chart) report::write_chart(spec, *r.chart);
}

stats::Baseline choose_baseline(const ControlChartRequest& r, const report::SeriesView& s) {
  const std::size_t n = s.points.size();
  if (r.baseline_count && (r.baseline_from || r.baseline_to))
    throw InputError("--baseline and --baseline-from/--baseline-to choose the baseline two ways; give one.");
  if (r.baseline_count) {
    if (*r.baseline_count < 2)
      throw InputError(fmt::format("--baseline {} is too small; control limits need at least 2 results.",
                                   *r.baseline_count));
    if (*r.baseline_count > n)
      throw InputError(fmt::format("--baseline {} is larger than the {} result(s) of {} in the history of {}.",
                                   *r.baseline_count, n, s.quantity.key, s.instrument_id));
    return {0, *r.baseline_count};
  }
  const Period p = parse_period(r.baseline_from, r.baseline_to);
  std::optional<std::size_t> first;
  std::size_t count = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const Date d = s.points[i].date;
    if ((p.from && d < *p.from) || (p.to && d > *p.to)) continue;
    if (!first) first = i;
    ++count;
  }
  if (count < 2)
    throw InputError(fmt::format("--baseline-from/--baseline-to {} to {} hold {} result(s) of {}; control limits "
                                 "need at least 2.",
                                 r.baseline_from.value_or("the start"), r.baseline_to.value_or("the end"), count,
                                 s.instrument_id));
  return {*first, count};
}

report::SeriesView require_series(store::Database& db, const TrendRequest& r, std::size_t at_least,
                                  const char* what) {
  const InstrumentInfo inst = find_instrument(db, r.instrument);
  const HistoryQuantity& q = find_quantity(r.quantity, inst);
  report::SeriesView s = series_view(db, inst, q, r.period);
  if (s.points.size() < at_least)
    throw InputError(fmt::format("instrument {} has {} result(s) of {} in the period; {} needs at least {}.",
                                 r.instrument, s.points.size(), s.quantity.key, what, at_least));
  return s;
}

}  // namespace

report::HistoryChartMarks chart_marks(const report::SeriesView& s, const report::HistoryView& all) {
  report::HistoryChartMarks m;
  std::map<std::int64_t, const report::HistoryRow*> by_id;
  for (const auto& row : all.rows) by_id[row.run_id] = &row;
  for (const auto id : s.run_ids) {
    const auto it = by_id.find(id);
    m.outcomes.push_back(it != by_id.end() && it->second->verdict == "fail" ? report::ChartPoint::Outcome::failed
                                                                            : report::ChartPoint::Outcome::pass);
  }
  const auto column =
      std::find_if(all.columns.begin(), all.columns.end(), [&](const auto& c) { return c.key == s.quantity.key; });
  const report::HistoryRow* latest = nullptr;
  for (const auto& row : all.rows) {
    if (column != all.columns.end()) {
      const auto k = static_cast<std::size_t>(column - all.columns.begin());
      if (row.void_reason && row.values[k]) m.void_runs.push_back({row.date, *row.values[k], 0.0});
    }
    if (row.current() && row.procedure == checks::Procedure::calibration && row.results && row.results->is_object() &&
        row.results->value("adjusted", false)) {
      m.adjustments.emplace_back(row.date, fmt::format("adjusted (run {})", row.run_id));
      if (!latest || row.date > latest->date || (row.date == latest->date && row.run_id > latest->run_id))
        latest = &row;
    }
  }
  if (latest) {
    std::size_t i = 0;
    while (i < s.points.size() && i < s.run_ids.size() &&
           (s.points[i].date < latest->date || (s.points[i].date == latest->date && s.run_ids[i] < latest->run_id)))
      ++i;
    m.fitted_from = i;
  }
  return m;
}

stats::DriftResult drift_in_period(const report::SeriesView& s, const report::HistoryChartMarks& marks) {
  stats::DriftOptions options;
  options.tolerance = s.quantity.tolerance;
  options.unit = s.quantity.unit;
  options.quantity = s.quantity.label;
  const std::size_t from = std::min(marks.fitted_from.value_or(0), s.points.size());
  return stats::analyse_drift(std::span(s.points).subspan(from), options);
}

void require_chart_path(const std::optional<std::filesystem::path>& chart) {
  if (!chart) return;
  report::chart_format_for(*chart);
  const auto folder = chart->parent_path();
  if (!folder.empty() && !std::filesystem::is_directory(folder))
    throw InputError(fmt::format("--chart \"{}\": the folder \"{}\" does not exist.", chart->string(), folder.string()));
}

report::ChartSpec history_chart(const report::SeriesView& current, const report::HistoryView& all) {
  std::vector<stats::Observation> superseded;
  const auto column = std::find_if(all.columns.begin(), all.columns.end(),
                                   [&](const auto& c) { return c.key == current.quantity.key; });
  if (column != all.columns.end()) {
    const auto k = static_cast<std::size_t>(column - all.columns.begin());
    for (const auto& row : all.rows)
      if (row.superseded_by && row.values[k]) superseded.push_back({row.date, *row.values[k], 0.0});
  }
  auto spec = report::history_chart_spec(current.points, superseded, current.quantity.tolerance, labels_of(current),
                                         chart_marks(current, all));
  add_basis_notes(spec, current);
  return spec;
}

report::ChartSpec control_chart_spec(const report::ControlChartView& v, const report::HistoryChartMarks& marks) {
  auto spec =
      report::control_chart_spec(v.series.points, v.chart, v.series.quantity.tolerance, labels_of(v.series), marks);
  add_basis_notes(spec, v.series);
  return spec;
}

report::ChartSpec drift_chart_spec(const report::DriftView& v, const report::HistoryChartMarks& marks) {
  auto spec =
      report::drift_chart_spec(v.series.points, v.drift, v.series.quantity.tolerance, labels_of(v.series), marks);
  add_basis_notes(spec, v.series);
  return spec;
}

report::HistoryView history(store::Database& db, const TrendRequest& r) {
  require_chart_path(r.chart);
  const InstrumentInfo inst = find_instrument(db, r.instrument);
  const HistoryQuantity& q = find_quantity(r.quantity, inst);
  // --quantity named: that column only, in every format, and only if the instrument has such a result.
  if (!r.quantity.empty()) require_results(db, inst, q, r.quantity);
  report::HistoryView view =
      r.quantity.empty() ? history_view(db, inst, r.period) : history_view(db, inst, r.period, {&q});
  if (r.chart) {
    const report::SeriesView s = series_view(db, inst, q, r.period);
    if (s.points.empty())
      throw InputError(fmt::format("--chart: instrument {} has no result of {} in the period to draw.", r.instrument,
                                   q.key));
    write_if_asked(history_chart(s, view), r);
  }
  return view;
}

report::ControlChartView control_chart(store::Database& db, const ControlChartRequest& r) {
  require_chart_path(r.trend.chart);
  report::ControlChartView v{require_series(db, r.trend, 2, "a control chart"), {}};
  stats::ControlChartOptions options;
  if (r.baseline_count || r.baseline_from || r.baseline_to) options.baseline = choose_baseline(r, v.series);
  options.unit = v.series.quantity.unit;
  v.chart = stats::individuals_chart(v.series.points, options);
  if (r.trend.chart) {
    const auto all = history_view(db, find_instrument(db, r.trend.instrument), r.trend.period);
    write_if_asked(control_chart_spec(v, chart_marks(v.series, all)), r.trend);
  }
  return v;
}

report::DriftView drift(store::Database& db, const TrendRequest& r) {
  require_chart_path(r.chart);
  report::DriftView v{require_series(db, r, 1, "a drift analysis"), {}};
  // An adjustment starts a new drift: the line is fitted within the latest adjustment period only.
  const auto marks = chart_marks(v.series, history_view(db, find_instrument(db, r.instrument), r.period));
  v.drift = drift_in_period(v.series, marks);
  write_if_asked(drift_chart_spec(v, marks), r);
  return v;
}

report::IntervalReviewView interval_review(store::Database& db, const TrendRequest& r) {
  const InstrumentInfo inst = find_instrument(db, r.instrument);
  const HistoryQuantity& q = find_quantity(r.quantity, inst);
  return interval_review(read_run_history(db, inst), q, r.period);
}

report::IntervalReviewView interval_review(const RunHistory& h, const HistoryQuantity& q, const Period& period) {
  const InstrumentInfo& inst = h.instrument;
  report::IntervalReviewView v;
  v.instrument_id = inst.id;
  v.instrument_title = inst.title;
  v.current = inst.every;

  // Method 1 reads the verdict of every current run, whatever its procedure (no quantity needed).
  const report::HistoryView all = history_view(h, period, {});
  std::vector<stats::CheckOutcome> outcomes;
  for (const auto& row : all.rows)
    if (row.current()) outcomes.push_back({row.date, row.verdict == "pass"});
  if (outcomes.empty())
    throw InputError(fmt::format("instrument {} has no check in the period; there is no history to review.", inst.id));
  v.staircase = stats::staircase_review(inst.every, outcomes);

  const report::SeriesView s = series_view(h, q, period);
  v.quantity_label = s.quantity.label;
  stats::ControlChartReviewOptions options;
  options.tolerance = s.quantity.tolerance;
  options.unit = s.quantity.unit;
  v.control_chart = stats::control_chart_review(inst.every, s.points, options);

  // The more cautious method decides: a shorter interval is never overruled by a longer one.
  const bool chart_shorter = v.control_chart->recommended_days < v.staircase.recommended_days;
  v.recommended = chart_shorter ? *v.control_chart : v.staircase;
  v.combination = fmt::format(
      "plumb follows the more cautious of the two methods: the {} gives {} days, the {} gives {} days, so the "
      "recommendation is {} days ({}).",
      v.staircase.method, v.staircase.recommended_days, v.control_chart->method, v.control_chart->recommended_days,
      v.recommended.recommended_days, stats::to_string(v.recommended.action));
  return v;
}

}  // namespace plumb::app
