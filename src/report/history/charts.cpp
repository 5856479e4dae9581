#include "report/history/charts.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "report/chart/axis_ticks.hpp"

namespace plumb::report {

const char* const history_chart_caution =
    "Where this instrument serves medicine, clinical or food weighing, this chart supports and does not replace "
    "accredited calibration, the lab's quality procedures and local regulations; take an instrument out of use "
    "when a check fails.";

namespace {

ChartSpec base(std::span<const stats::Observation> h, const stats::ToleranceLimits& tol, const HistoryChartLabels& l,
               std::string what, const HistoryChartMarks& marks) {
  ChartSpec s;
  s.title = fmt::format("{}: {}, {}", l.instrument, l.quantity, what);
  if (!h.empty())
    s.subtitle = fmt::format("{} to {}, {} check(s)", to_string(h.front().date), to_string(h.back().date), h.size());
  s.x = {"Date of check", "", AxisScale::date};
  s.y = {l.quantity, l.unit, AxisScale::number};
  s.y_non_negative = l.non_negative;
  ChartSeries series{"check result", {}};
  for (const auto& o : h)
    series.points.push_back(
        {date_axis_value(o.date), o.value, o.expanded_uncertainty > 0 ? std::optional(o.expanded_uncertainty) : std::nullopt, false});
  for (std::size_t i = 0; i < series.points.size() && i < marks.outcomes.size(); ++i)
    series.points[i].outcome = marks.outcomes[i];
  s.series.push_back(std::move(series));
  if (!marks.void_runs.empty()) {
    ChartSeries voided{"void run (entered in error)", {}};
    for (const auto& o : marks.void_runs)
      voided.points.push_back({date_axis_value(o.date), o.value, std::nullopt, false, ChartPoint::Outcome::void_run});
    s.series.push_back(std::move(voided));
    s.notes.push_back(
        fmt::format("{} void run(s) are drawn as open squares; no statistic uses them.", marks.void_runs.size()));
  }
  if (std::any_of(marks.outcomes.begin(), marks.outcomes.end(),
                  [](auto o) { return o == ChartPoint::Outcome::failed; }))
    s.notes.push_back("A failed check is drawn as a cross; the instrument was out of service until a passing check.");
  for (const auto& [date, label] : marks.adjustments) s.markers.push_back({date_axis_value(date), label});
  if (tol.lower || tol.upper) s.tolerance = ToleranceBand{tol.lower, tol.upper, "tolerance limit"};
  return s;
}

std::string unit_suffix(const std::string& unit) { return unit.empty() ? "" : " " + unit; }

}  // namespace

ChartSpec drift_chart_spec(std::span<const stats::Observation> h, const stats::DriftResult& d,
                           const stats::ToleranceLimits& tol, const HistoryChartLabels& l,
                           const HistoryChartMarks& marks) {
  ChartSpec s = base(h, tol, l, "drift", marks);
  if (marks.fitted_from && *marks.fitted_from > 0 && *marks.fitted_from < h.size())
    s.notes.push_back(fmt::format(
        "The trend is fitted to the {} result(s) from {} on only, after the latest adjustment: an adjustment starts "
        "a new drift, so results before it are drawn but not fitted.",
        h.size() - *marks.fitted_from, to_string(h[*marks.fitted_from].date)));
  if (!d.fit) {
    s.notes.push_back(d.message);
  } else if (!d.slope_significant) {
    s.notes.push_back(fmt::format("No trend line is drawn: the slope does not differ significantly from zero "
                                  "(p = {:.2g}).",
                                  d.slope_p_value));
  } else {
    const double x0 = date_axis_value(d.origin);
    TrendLine t;
    t.x0 = x0;
    t.y0 = d.fit->predict(0);
    t.x1 = x0 + d.span_days;
    t.y1 = d.fit->predict(d.span_days);
    int end_day = d.span_days;
    if (d.reached && d.reached->extent == stats::Extent::extrapolation) {
      end_day = d.reached->day;
      t.x_extrapolated = x0 + end_day;
      t.y_extrapolated = d.fit->predict(end_day);
    }
    for (int day = 0; day <= end_day; day += std::max(1, end_day / 60)) {
      const auto b = d.band(day);
      t.prediction_band.push_back({x0 + day, b.lower, b.upper});
    }
    const auto b = d.band(end_day);
    if (t.prediction_band.back().x != x0 + end_day) t.prediction_band.push_back({x0 + end_day, b.lower, b.upper});
    t.label = fmt::format("{}\nd = days since {}\nR\u00b2 = {:.4f}, RMSE = {:.3g}{}", d.equation(),
                          to_string(d.origin), d.fit->r_squared, d.fit->rmse, unit_suffix(l.unit));
    if (d.reached)
      t.label += fmt::format("\nreaches the {} limit on {} ({})", d.reached->upper ? "upper" : "lower",
                             to_string(d.reached->date), to_string(d.reached->extent));
    else
      t.label += fmt::format("\nno limit reached by {} (projection horizon)", to_string(d.horizon));
    s.trend = std::move(t);
  }
  s.notes.push_back(history_chart_caution);
  return s;
}

ChartSpec history_chart_spec(std::span<const stats::Observation> current,
                             std::span<const stats::Observation> superseded, const stats::ToleranceLimits& tol,
                             const HistoryChartLabels& l, const HistoryChartMarks& marks) {
  ChartSpec s = base(current, tol, l, "history", marks);
  if (!superseded.empty()) {
    ChartSeries old{"superseded by a correction", {}};
    for (const auto& o : superseded) old.points.push_back({date_axis_value(o.date), o.value, std::nullopt, false});
    s.series.push_back(std::move(old));
    s.notes.push_back(fmt::format("{} superseded result(s) are drawn apart; the statistics use the corrections.",
                                  superseded.size()));
  }
  s.notes.push_back(history_chart_caution);
  return s;
}

ChartSpec control_chart_spec(std::span<const stats::Observation> h, const stats::ControlChart& c,
                             const stats::ToleranceLimits& tol, const HistoryChartLabels& l,
                             const HistoryChartMarks& marks) {
  ChartSpec s = base(h, tol, l, "individuals control chart", marks);
  s.control = ControlLines{c.limits.centre, c.limits.lcl(), c.limits.ucl()};
  const std::size_t first = c.limits.baseline_first, count = c.limits.baseline_count;
  if (count > 0 && first + count <= h.size())
    s.baseline = XSpan{date_axis_value(h[first].date), date_axis_value(h[first + count - 1].date),
                       fmt::format("baseline: {} result(s), {} to {}", count, to_string(h[first].date),
                                   to_string(h[first + count - 1].date))};
  for (std::size_t i : c.flagged_indices())
    if (i < s.series[0].points.size()) s.series[0].points[i].flagged = true;
  s.notes.push_back(c.method);
  for (const auto& f : c.flags) s.notes.push_back(f.explanation);
  s.notes.push_back(history_chart_caution);
  return s;
}

}  // namespace plumb::report
