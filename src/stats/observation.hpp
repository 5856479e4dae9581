#pragma once
// One result of a check in an instrument's history, as the trend statistics see it: when it was taken,
// the result (bias, repeatability SD, systematic error ... in one unit chosen by the caller) and the
// expanded uncertainty U of that result (0 when unknown). Plain values, so the statistics stay pure
// functions and never need the database.
#include <optional>
#include <span>

#include "core/dates.hpp"

namespace plumb::stats {

struct Observation {
  Date date;
  double value = 0.0;
  double expanded_uncertainty = 0.0;  ///< U (k about 2), same unit as value
};

/// Tolerance limits on the result; either side may be absent (a one-sided limit, e.g. an SD).
struct ToleranceLimits {
  std::optional<double> lower;
  std::optional<double> upper;
};

/// Throws InputError unless every value and uncertainty is finite, U >= 0 and dates never go backwards.
void require_well_formed(std::span<const Observation> history, std::string_view what);

}  // namespace plumb::stats
