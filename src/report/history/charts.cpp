#include "report/history/charts.hpp"

#include <fmt/format.h>

#include "report/chart/axis_ticks.hpp"

namespace plumb::report {

const char* const history_chart_caution =
    "Where this instrument serves medicine, clinical or food weighing, this chart supports and does not replace "
    "accredited calibration, the lab's quality procedures and local regulations; take an instrument out of use "
    "when a check fails.";

namespace {

ChartSpec base(std::span<const stats::Observation> h, const stats::ToleranceLimits& tol, const HistoryChartLabels& l,
               std::string what) {
  ChartSpec s;
  s.title = fmt::format("{}: {}, {}", l.instrument, l.quantity, what);
  if (!h.empty())
    s.subtitle = fmt::format("{} to {}, {} check(s)", to_string(h.front().date), to_string(h.back().date), h.size());
  s.x = {"Date of check", "", AxisScale::date};
  s.y = {l.quantity, l.unit, AxisScale::number};
  ChartSeries series{"check result", {}};
  for (const auto& o : h)
    series.points.push_back(
        {date_axis_value(o.date), o.value, o.expanded_uncertainty > 0 ? std::optional(o.expanded_uncertainty) : std::nullopt, false});
  s.series.push_back(std::move(series));
  if (tol.lower || tol.upper) s.tolerance = ToleranceBand{tol.lower, tol.upper, "tolerance limit"};
  return s;
}

std::string unit_suffix(const std::string& unit) { return unit.empty() ? "" : " " + unit; }

}  // namespace

ChartSpec drift_chart_spec(std::span<const stats::Observation> h, const stats::DriftResult& d,
                           const stats::ToleranceLimits& tol, const HistoryChartLabels& l) {
  ChartSpec s = base(h, tol, l, "drift");
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

ChartSpec history_chart_spec(std::span<const stats::Observation> current, std::span<const stats::Observation> superseded,
                             const stats::ToleranceLimits& tol, const HistoryChartLabels& l) {
  ChartSpec s = base(current, tol, l, "history");
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
                             const stats::ToleranceLimits& tol, const HistoryChartLabels& l) {
  ChartSpec s = base(h, tol, l, "individuals control chart");
  s.control = ControlLines{c.limits.centre, c.limits.lcl(), c.limits.ucl()};
  for (std::size_t i : c.flagged_indices())
    if (i < s.series[0].points.size()) s.series[0].points[i].flagged = true;
  s.notes.push_back(c.method);
  for (const auto& f : c.flags) s.notes.push_back(f.explanation);
  s.notes.push_back(history_chart_caution);
  return s;
}

}  // namespace plumb::report
