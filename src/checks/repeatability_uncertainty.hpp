#pragma once
// The uncertainty of the weekly check's two results, bias and repeatability SD, in one place: the check
// computes it when a run is recorded, and `history` computes it from what older runs stored.
//
// Bias E = mean - m_c (GUM, JCGM 100:2008, 4.2 and 5.1.2, inputs uncorrelated, all sensitivities 1):
//   u(mean)      = s / sqrt(n)       Type A, n - 1 degrees of freedom; the rounding of each loaded reading
//                                    varies from reading to reading and is inside s;
//   u(reference) = U_w / k_w         the reference weight's certificate (Type B, normal);
//   u(zero)      = d / (2 sqrt 3)    rounding of the zero indication, set once and so common to every reading
//                                    (rectangular of half-width d / 2, GUM 4.3.7 and F.2.2.1).
//   U(E) = 2 u_c(E).
// Air buoyancy and eccentricity are left out: the check compares indications with the weight's conventional
// mass near reference air and uses one centred load. This is the uncertainty of the check, not a full
// EURAMET cg-18 calibration budget.
//
// Repeatability SD s of n normal readings: u(s) = s / sqrt(2 (n - 1)) (GUM E.4.3, the large-n approximation
// of the chi distribution of s with n - 1 degrees of freedom); U(s) = 2 u(s).
//
// k = 2 is fixed (coverage probability about 95 %), as on the lab's other certificates.
#include <optional>

#include "core/units.hpp"

namespace plumb::checks {

inline constexpr double weekly_check_coverage_k = 2.0;

struct RepeatabilityUncertaintyInput {
  Mass sd;                                ///< s from the readings
  long long n = 0;                        ///< number of readings
  Mass readability;                       ///< d
  std::optional<Mass> weight_expanded_u;  ///< U_w from the weight's certificate, when known
  double weight_k = 2.0;                  ///< its k
};

struct RepeatabilityUncertainty {
  Mass bias_standard;  ///< u_c(E)
  Mass bias_expanded;  ///< U(E) = k u_c(E)
  Mass sd_expanded;    ///< U(s) = k s / sqrt(2 (n - 1)); 0 for n < 2
  double k = weekly_check_coverage_k;
};

/// Throws InputError when n < 1 or the weight's k is not positive.
RepeatabilityUncertainty repeatability_uncertainty(const RepeatabilityUncertaintyInput& in);

}  // namespace plumb::checks
