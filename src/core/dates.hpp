#pragma once
// Calendar dates and check intervals, on Howard Hinnant's date library so that calendar arithmetic
// (month ends, leap years) is done by a library that gets it right.
#include <date/date.h>

#include <string>
#include <string_view>

namespace plumb {

using Date = date::year_month_day;

/// Parses an ISO 8601 calendar date "YYYY-MM-DD"; throws InputError naming `field`.
Date parse_date(std::string_view text, std::string_view field = "date");
std::string to_string(Date d);
/// Signed number of days from a to b.
int days_between(Date a, Date b);
Date add_days(Date d, int days);
/// Today's date in UTC.
Date today_utc();
/// Today's date where plumb runs (the local time zone, TZ): the default of every --on and --since.
Date today_local();

/// A check or calibration interval: 7d, 4w, 6mo, 1y.
struct Interval {
  enum class Unit { day, week, month, year };
  int count = 0;
  Unit unit = Unit::day;

  /// Parses "7d", "4w", "6mo", "1y" (count 1..9999); throws InputError naming `field`.
  static Interval parse(std::string_view text, std::string_view field = "interval");
  [[nodiscard]] std::string to_string() const;
  /// Approximate length in days, for comparing intervals (a month counts 30.44 days).
  [[nodiscard]] double approx_days() const;
  friend bool operator==(const Interval&, const Interval&) = default;
};

/// d + interval. Adding months or years to the 31st lands on the last day of a shorter month.
Date add_interval(Date d, Interval i);

}  // namespace plumb
