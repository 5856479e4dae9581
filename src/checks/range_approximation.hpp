#pragma once
// The error of indication and its uncertainty as functions of the reading over the calibrated range (EURAMET
// cg-18 v4.0, the approximations of chapter 7 and its appendix C): from the error E_j, its combined standard
// uncertainty u(E_j) and the mean reading R_j at each calibrated load,
//   E_appr(R) = a1 R (through zero), a0 + a1 R (with offset) or a0 + a1 R + a2 R^2, by unweighted least squares
//               (stats::fit, the NIST-checked regression), the form following the run's fitted model;
//   u^2(E_appr(R)) = alpha^2 + beta^2 R^2, by least squares of v_j = u^2(E_j) + r_j^2 against R_j^2, where r_j is
//               the residual of the error approximation at load j, then raised by the largest shortfall so that
//               it covers v_j at every calibrated load (a negative slope is set to zero; a negative intercept
//               refits through zero). Adding r_j^2 and the envelope are plumb's own, conservative rule: the
//               approximation never states less than the budget of a calibrated load plus the model's miss there.
// U(E_appr(R)) = k u(E_appr(R)) with k the largest coverage factor of the calibrated loads.
#include <span>
#include <string>
#include <vector>

#include "core/units.hpp"
#include "stats/regression.hpp"

namespace plumb::checks {

/// One calibrated load as the approximation uses it (grams; stats works on plain numbers).
struct ApproximationPoint {
  double reading_g = 0;  ///< R_j: the mean indication at the load
  double error_g = 0;    ///< E_j
  double u_g = 0;        ///< u(E_j), combined standard uncertainty
  double k = 2;          ///< coverage factor of U(E_j)
};

struct RangeApproximation {
  stats::Fit error_fit;          ///< E against R; coef in stats::Fit's order
  double alpha_g = 0;            ///< alpha of u^2 = alpha^2 + beta^2 R^2, grams
  double beta = 0;               ///< beta (g per g of reading)
  double envelope_raise_g2 = 0;  ///< what was added to alpha^2 to cover every calibrated load
  double k = 2;
  double reading_min_g = 0, reading_max_g = 0;
  [[nodiscard]] double error_at(double reading_g) const { return error_fit.predict(reading_g); }
  [[nodiscard]] double u_at(double reading_g) const;
  [[nodiscard]] double expanded_at(double reading_g) const { return k * u_at(reading_g); }
  /// "E(R) = +2.1000e-06 R", "E(R) = -1.0000e-05 g +2.1000e-06 R", with the quadratic term when there is one.
  [[nodiscard]] std::string error_formula() const;
  /// "u(E(R)) = sqrt((0.120 mg)^2 + (1.5e-06 R)^2)".
  [[nodiscard]] std::string uncertainty_formula() const;
  /// The form in words: "straight line through zero", "straight line with offset", "quadratic".
  [[nodiscard]] std::string form() const;
};

/// Throws InputError when there are fewer points than the model needs or a u is not positive.
RangeApproximation approximate_over_range(std::span<const ApproximationPoint> points, stats::Model model);

}  // namespace plumb::checks
