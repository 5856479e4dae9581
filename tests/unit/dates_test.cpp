#include <catch2/catch.hpp>

#include "core/dates.hpp"
#include "core/errors.hpp"

using namespace plumb;

TEST_CASE("ISO dates parse and refuse impossible days", "[dates]") {
  CHECK(to_string(parse_date("2026-11-30")) == "2026-11-30");
  for (const char* bad : {"2026-02-30", "2026-13-01", "30/11/2026", "2026-1-5", "", "2026-11-30T10:00"}) {
    INFO(bad);
    CHECK_THROWS_AS(parse_date(bad, "--on"), InputError);
  }
  CHECK(to_string(parse_date("2028-02-29")) == "2028-02-29");  // leap year
}

TEST_CASE("intervals add calendar time the way a lab schedules it", "[dates]") {
  CHECK(to_string(add_interval(parse_date("2026-11-30"), Interval::parse("7d"))) == "2026-12-07");
  CHECK(to_string(add_interval(parse_date("2026-12-28"), Interval::parse("1w"))) == "2027-01-04");
  // Month ends: 31 January + 1 month lands on the last day of February.
  CHECK(to_string(add_interval(parse_date("2026-01-31"), Interval::parse("1mo"))) == "2026-02-28");
  CHECK(to_string(add_interval(parse_date("2028-02-29"), Interval::parse("1y"))) == "2029-02-28");
  CHECK(to_string(add_interval(parse_date("2026-03-02"), Interval::parse("6mo"))) == "2026-09-02");
  CHECK(days_between(parse_date("2026-12-01"), parse_date("2026-11-30")) == -1);
  for (const char* bad : {"7", "d", "0d", "7days", "-7d", "1.5y", "99999d"}) {
    INFO(bad);
    CHECK_THROWS_AS(Interval::parse(bad, "--every"), InputError);
  }
}

TEST_CASE("dates are written as the date library's %F writes them, every day of the accepted years", "[dates]") {
  // to_string writes the digits by hand (fast path); the library's own formatter is the reference.
  const date::sys_days first{date::year{1900} / 1 / 1}, last{date::year{2999} / 12 / 31};
  long long differing = 0;
  for (date::sys_days d = first; d <= last; d += date::days{1})
    if (to_string(Date{d}) != date::format("%F", d)) ++differing;
  CHECK(differing == 0);
  CHECK(to_string(Date{date::year{1900} / 1 / 1}) == "1900-01-01");
  CHECK(to_string(Date{date::year{812} / 7 / 9}) == "0812-07-09");
}
