#include "report/chart/axis_ticks.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace plumb::report {

double nice_step(double raw) {
  const double decade = std::pow(10.0, std::floor(std::log10(raw)));
  for (double m : {1.0, 2.0, 5.0}) {
    // A relative tolerance keeps 0.2 on 0.2 although log10 and pow round.
    if (m * decade >= raw * (1 - 1e-9)) return m * decade;
  }
  return 10 * decade;
}

AxisTicks number_ticks(double lo, double hi, int target) {
  if (hi < lo) std::swap(lo, hi);
  if (hi == lo) {
    const double pad = lo == 0 ? 1.0 : std::abs(lo) * 0.1;
    lo -= pad;
    hi += pad;
  }
  AxisTicks t;
  t.step = nice_step((hi - lo) / std::max(1, target));
  // Rounding outwards to whole steps; the small slack stops a value a hair above a step adding a step.
  t.min = std::floor(lo / t.step + 1e-9) * t.step;
  t.max = std::ceil(hi / t.step - 1e-9) * t.step;
  const int decimals = std::max(0, -static_cast<int>(std::floor(std::log10(t.step) + 1e-9)));
  const long n = std::lround((t.max - t.min) / t.step);
  for (long i = 0; i <= n; ++i) {
    double v = t.min + static_cast<double>(i) * t.step;
    if (std::abs(v) < t.step * 1e-9) v = 0;  // no "-0.00"
    t.ticks.push_back({v, fmt::format("{:.{}f}", v, decimals)});
  }
  return t;
}

double date_axis_value(Date d) { return static_cast<double>(date::sys_days{d}.time_since_epoch().count()); }

Date date_from_axis_value(double v) { return Date{date::sys_days{date::days{static_cast<int>(std::floor(v))}}}; }

namespace {

struct DateStep {
  int days = 0, months = 0, years = 0;
  [[nodiscard]] double approx_days() const { return days + months * 30.44 + years * 365.25; }
};

Date step_forward(Date d, const DateStep& s) {
  if (s.days) return add_days(d, s.days);
  if (s.months) return add_interval(d, Interval{s.months, Interval::Unit::month});
  return add_interval(d, Interval{s.years, Interval::Unit::year});
}

// The first tick at or before `d`, on a boundary the step makes natural (a Monday for weeks, the 1st
// of a month, 1 January of a year divisible by the step).
Date tick_floor(Date d, const DateStep& s) {
  if (s.days == 7 || s.days == 14) {
    const date::weekday wd{date::sys_days{d}};
    return add_days(d, -static_cast<int>((wd - date::Monday).count()));
  }
  if (s.days) return d;
  if (s.months) {
    const unsigned m0 = (static_cast<unsigned>(d.month()) - 1) / static_cast<unsigned>(s.months) *
                        static_cast<unsigned>(s.months);
    return Date{d.year(), date::month{m0 + 1}, date::day{1}};
  }
  const int y = static_cast<int>(d.year());
  const int y0 = y - ((y % s.years) + s.years) % s.years;
  return Date{date::year{y0}, date::January, date::day{1}};
}

std::string label(Date d, const DateStep& s) {
  if (s.days) return to_string(d);
  if (s.months) return date::format("%Y-%m", date::sys_days{d});
  return date::format("%Y", date::sys_days{d});
}

}  // namespace

AxisTicks date_ticks(double lo, double hi, int max_ticks) {
  if (hi < lo) std::swap(lo, hi);
  if (hi - lo < 1) {
    lo -= 1;
    hi += 1;
  }
  std::vector<DateStep> steps{{1, 0, 0}, {2, 0, 0}, {7, 0, 0}, {14, 0, 0}, {0, 1, 0}, {0, 2, 0},
                              {0, 3, 0}, {0, 6, 0}, {0, 0, 1}, {0, 0, 2}, {0, 0, 5}};
  for (int y = 10; y <= 1000; y *= 10) {
    steps.push_back({0, 0, y});
    steps.push_back({0, 0, 2 * y});
    steps.push_back({0, 0, 5 * y});
  }
  const Date first = date_from_axis_value(lo);
  const Date last = date_from_axis_value(std::ceil(hi));
  for (const DateStep& s : steps) {
    // Ticks from the boundary at or before the first day to the first boundary at or after the last.
    std::vector<Date> dates{tick_floor(first, s)};
    while (dates.back() < last) dates.push_back(step_forward(dates.back(), s));
    if (static_cast<int>(dates.size()) > max_ticks && &s != &steps.back()) continue;
    AxisTicks t;
    t.step = s.approx_days();
    t.min = date_axis_value(dates.front());
    t.max = date_axis_value(dates.back());
    for (const Date& d : dates) t.ticks.push_back({date_axis_value(d), label(d, s)});
    return t;
  }
  return {};
}

}  // namespace plumb::report
