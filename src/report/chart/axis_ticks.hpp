#pragma once
// Where to put grid lines and what to write under them. Numbers step in the 1-2-5 series (common
// practice for readable axes); dates step in days, weeks, months or years and are written ISO 8601.
#include <string>
#include <vector>

#include "core/dates.hpp"

namespace plumb::report {

struct Tick {
  double value;
  std::string label;
};

struct AxisTicks {
  double min = 0.0, max = 1.0;  ///< the axis range, widened to whole steps so no data sits off-scale
  double step = 0.1;            ///< for numbers; for dates the typical step in days
  std::vector<Tick> ticks;
};

/// The smallest 1, 2 or 5 times a power of ten that is >= raw (raw > 0).
double nice_step(double raw);

/// Ticks covering [lo, hi] with about `target` intervals; the range is widened to whole steps.
/// lo == hi is widened symmetrically. Labels carry the decimals the step needs, no more.
AxisTicks number_ticks(double lo, double hi, int target = 6);

/// A date axis position: days since 1970-01-01.
double date_axis_value(Date d);
Date date_from_axis_value(double v);

/// Ticks for a date axis over [lo, hi] (days since 1970-01-01) with at most `max_ticks` ticks: steps of
/// 1, 2, 7 or 14 days (labels YYYY-MM-DD), 1, 2, 3 or 6 months (YYYY-MM, on the 1st) or 1, 2, 5, 10...
/// years (YYYY, on 1 January); the range is widened to whole steps.
AxisTicks date_ticks(double lo, double hi, int max_ticks = 7);

}  // namespace plumb::report
