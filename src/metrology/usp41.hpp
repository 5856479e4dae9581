#pragma once
// USP General Chapter <41> Balances (2013 onwards, as summarised in reference-data/README.md):
// repeatability is satisfactory when 2 s / m <= 0.10 % for the smallest net weight m, with s taken as
// at least 0.41 d; accuracy is satisfactory when the test weight reads within 0.10 % of its value.
#include "core/units.hpp"

namespace plumb::usp41 {

inline constexpr double repeatability_factor = 2000.0;  ///< m_min = 2000 * s  (2 s / m = 0.10 %)
inline constexpr double sd_floor_in_d = 0.41;           ///< s is replaced by 0.41 d when smaller
inline constexpr double accuracy_limit_fraction = 0.001; ///< 0.10 % of the test weight's value
inline constexpr double test_load_min_fraction = 0.05;  ///< the test weight is 5 % to 100 % of capacity
/// Repeatability: "not less than 10 replicate weighings" of one test weight.
inline constexpr int min_replicate_weighings = 10;

/// The standard deviation USP <41> uses: max(s, 0.41 d).
inline Mass effective_sd(Mass s, Mass d) {
  return s < sd_floor_in_d * d ? sd_floor_in_d * d : s;
}
/// Minimum weight m_min = 2000 * max(s, 0.41 d).
inline Mass minimum_weight(Mass s, Mass d) { return repeatability_factor * effective_sd(s, d); }
/// The accuracy limit: 0.10 % of the reference value of the test load.
inline Mass accuracy_limit(Mass reference) {
  return accuracy_limit_fraction * abs(reference);
}

}  // namespace plumb::usp41
