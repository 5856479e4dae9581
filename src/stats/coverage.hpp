#pragma once
// Coverage factors for an expanded uncertainty U = k u_c (GUM, JCGM 100:2008, Annex G).
// k is the two-sided Student's t quantile for the effective degrees of freedom; with infinitely many
// degrees of freedom it is the normal quantile. Computed with Boost.Math.
#include <limits>

namespace plumb::stats {

/// Degrees of freedom of a Type B contribution (known exactly): infinity.
inline constexpr double infinite_dof = std::numeric_limits<double>::infinity();

/// The coverage probability GUM calls 95.45 %: the probability that a normal quantity lies within
/// two standard deviations of its mean, 2 Phi(2) - 1 = erf(sqrt 2) = 0.954499736..., so that k = 2
/// exactly for infinite degrees of freedom.
double p_95_45();
/// 95 %, the other column of GUM Table G.2.
inline constexpr double p_95 = 0.95;

/// k = t_p(nu): two-sided Student's t quantile, P(|t| <= k) = p. `dof` may be fractional or infinite
/// (then the normal quantile). Throws InputError when dof <= 0 or p is not in (0, 1).
double coverage_factor(double dof, double p);
inline double coverage_factor_95_45(double dof) { return coverage_factor(dof, p_95_45()); }

}  // namespace plumb::stats
