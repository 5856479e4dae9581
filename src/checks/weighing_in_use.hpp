#pragma once
// The uncertainty of a weighing result in normal use (EURAMET cg-18 v4.0, "uncertainty of a weighing result",
// chapters 7 and 8) and the minimum weight that follows from it with the lab's required relative accuracy and
// safety factor (USP <1251> usage, cg-18 usage).
//
// From the calibration, the approximation over the range (checks/range_approximation):
//   u^2(E_appr(R)) = alpha_E^2 + beta_E^2 R^2.
// The terms of normal use the lab declares for the balance, absolute (alpha) or relative to the reading (beta):
//   rounding at zero              d_0 / (2 sqrt 3)                                  absolute
//   rounding at load              d_L / (2 sqrt 3)                                  absolute
//   repeatability in use          s_use (a single reading: u = s)                   absolute
//   temperature change in use     TK dT / (2 sqrt 3) (dT the full width, rectangular)  relative
//   buoyancy of the sample        u of delta_m_B / m for a sample of density rho_s (u(rho_s)) against the
//                                 conventional adjustment (8000 kg/m3) in air 1.2 kg/m3 with u(rho_a),
//                                 metrology/buoyancy (the correction itself is zero: results are conventional)
//                                                                                    relative
//   drift since calibration       D_rel / sqrt 3, rectangular                       relative
// u^2(W) = alpha^2 + beta^2 W^2 with alpha^2 = alpha_E^2 + sum of the absolute terms squared and beta^2 =
// beta_E^2 + sum of the relative terms squared (the calibration's own rounding and repeatability stay inside
// alpha_E: counted twice, on the safe side).
// Expanded, U(W) = k u(W) when the error is corrected (W = R - E_appr(R)), and k u(W) + |E_appr(R)| when it is
// not (the global uncertainty). Two forms over the range:
//   linear         U(W) = a + b W, a = k alpha (+ |a0|), b = k beta (+ |a1| + |a2| Max when not corrected),
//                  an upper bound of the quadratic sum because sqrt(alpha^2 + beta^2 W^2) <= alpha + beta W;
//   quadratic sum  U(W) = k sqrt(alpha^2 + beta^2 W^2) (+ |E_appr(W)|).
// Minimum weight: the smallest W with SF U(W) / W <= A (A the required relative accuracy, SF the safety factor):
//   linear: W_min = SF a / (A - SF b), when SF b < A; the quadratic sum is solved by bisection.
#include <optional>
#include <string>

#include "checks/range_approximation.hpp"
#include "core/units.hpp"

namespace plumb::checks {

enum class InUseForm { linear, quadratic_sum };
std::string_view key(InUseForm f);  ///< "linear" | "quadratic-sum"

/// What the lab declares for a balance in normal use (all stated; none is assumed).
struct InUseTerms {
  Mass rounding_zero;              ///< d_0 in use
  Mass rounding_load;              ///< d_L in use
  Mass repeatability;              ///< s in use, of a single reading
  double temperature_range_k = 0;  ///< dT, full width of the temperature change in use, K
  double sensitivity_per_k = 0;    ///< TK, relative change of the sensitivity per K
  double sample_density_kg_m3 = 8000;
  double sample_density_u_kg_m3 = 0;
  double air_density_u_kg_m3 = 0;  ///< standard uncertainty of the air density in use about 1.2 kg/m3
  double drift_relative = 0;       ///< D_rel: largest relative change of the sensitivity since calibration
  bool error_corrected = false;    ///< results are corrected by E_appr(R)
  InUseForm form = InUseForm::linear;
  double required_relative = 0.001;  ///< A, e.g. 0.001 for 0.10 %
  double safety_factor = 2;          ///< SF >= 1
};

struct InUseTerm {
  std::string source;
  double u = 0;  ///< grams (absolute) or per gram (relative)
  bool relative = false;
  std::string note;
};

struct InUseUncertainty {
  std::vector<InUseTerm> terms;
  double alpha_g = 0, beta = 0;  ///< of u(W)
  double k = 2;
  double a_g = 0, b = 0;  ///< linear form U(W) = a + b W
  InUseForm form = InUseForm::linear;
  bool error_corrected = false;
  double capacity_g = 0;
  std::optional<double> minimum_weight_g;  ///< none when no load up to capacity meets the requirement
  std::string minimum_weight_basis;
  RangeApproximation calibration;                      ///< the approximation it builds on
  [[nodiscard]] double expanded_at(double w_g) const;  ///< U(W) in the stated form, grams
  [[nodiscard]] std::string formula() const;           ///< the stated form with its coefficients
};

/// Throws InputError naming the term for a negative value, A outside (0, 1), SF < 1.
InUseUncertainty in_use_uncertainty(const RangeApproximation& cal, const InUseTerms& t, Mass capacity);

}  // namespace plumb::checks
