#pragma once
// Summary statistics of exact decimals, computed from integer sums so that large values that
// differ only in their last digits (10000000.1, 10000000.3, ...) lose nothing to cancellation.
// The only rounding is the final conversion (one division and one square root in long double).
#include <span>

#include "core/decimal.hpp"

namespace plumb::stats {

struct ExactSummary {
  long long n = 0;
  int scale = 0;             ///< common scale of the data (max decimals)
  Int128 sum = 0;          ///< sum of x * 10^scale, exact
  Int128 centred_ss = 0;   ///< n * sum(x^2) - (sum x)^2, in units of 10^-2*scale, exact
  double min = 0.0;
  double max = 0.0;

  [[nodiscard]] double mean() const;
  /// Sample standard deviation (n - 1 in the denominator); 0 for n < 2.
  [[nodiscard]] double sd() const;
  [[nodiscard]] double variance() const;
  /// mean - reference computed exactly, then rounded once.
  [[nodiscard]] double mean_minus(Decimal reference) const;
};

/// Summarises `values`. Throws InputError if the exact sums would overflow 128 bits.
ExactSummary summarize_exact(std::span<const Decimal> values);

}  // namespace plumb::stats
