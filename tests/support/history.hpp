#pragma once
// Builds invented check histories for the trend tests: one result per week (or a given step) from a
// start date, with an optional expanded uncertainty. Header-only so it needs no build change.
#include <initializer_list>
#include <vector>

#include "core/dates.hpp"
#include "stats/observation.hpp"

namespace plumb::test {

inline std::vector<stats::Observation> weekly(std::initializer_list<double> values, double u = 0.0,
                                              const char* start = "2024-01-01", int step_days = 7) {
  std::vector<stats::Observation> h;
  Date d = parse_date(start);
  for (double v : values) {
    h.push_back({d, v, u});
    d = add_days(d, step_days);
  }
  return h;
}

inline std::vector<stats::Observation> concat(std::vector<stats::Observation> a, std::initializer_list<double> more,
                                              double u = 0.0) {
  Date d = a.empty() ? parse_date("2024-01-01") : add_days(a.back().date, 7);
  for (double v : more) {
    a.push_back({d, v, u});
    d = add_days(d, 7);
  }
  return a;
}

}  // namespace plumb::test
