#include "checks/weighing_in_use.hpp"

#include <fmt/format.h>

#include <cmath>

#include "core/errors.hpp"
#include "metrology/buoyancy.hpp"

namespace plumb::checks {

namespace {

double in_use_not_negative(double v, const char* field) {
  if (!std::isfinite(v) || v < 0) throw InputError(fmt::format("{} {} is negative; it must be 0 or more.", field, v));
  return v;
}

/// |E_appr(W)| bounded by a straight line over [0, Max]: |a0| + (|a1| + |a2| Max) W.
std::pair<double, double> error_bound_line(const RangeApproximation& cal, double capacity_g) {
  const auto& c = cal.error_fit.coef;
  switch (cal.error_fit.model) {
    case stats::Model::through_origin:
      return {0.0, std::abs(c.at(0))};
    case stats::Model::line:
      return {std::abs(c.at(0)), std::abs(c.at(1))};
    case stats::Model::quadratic:
      return {std::abs(c.at(0)), std::abs(c.at(1)) + std::abs(c.at(2)) * capacity_g};
  }
  return {0.0, 0.0};
}

}  // namespace

std::string_view key(InUseForm f) {
  switch (f) {
    case InUseForm::linear:
      return "linear";
    case InUseForm::quadratic_sum:
      return "quadratic-sum";
  }
  return "linear";
}

double InUseUncertainty::expanded_at(double w_g) const {
  if (form == InUseForm::linear) return a_g + b * w_g;
  const double u = std::sqrt(alpha_g * alpha_g + beta * beta * w_g * w_g);
  return k * u + (error_corrected ? 0.0 : std::abs(calibration.error_at(w_g)));
}

std::string InUseUncertainty::formula() const {
  const char* basis = error_corrected ? "results corrected for the error of indication"
                                      : "results not corrected: |E(W)| added (global uncertainty)";
  if (form == InUseForm::linear)
    return fmt::format("U(W) = {:.4g} mg + {:.4e} W (linear form, {})", a_g * 1e3, b, basis);
  return fmt::format("U(W) = {:.2f} sqrt(({:.4g} mg)^2 + ({:.4e} W)^2){} (quadratic-sum form, {})", k, alpha_g * 1e3,
                     beta, error_corrected ? "" : " + |E(W)|", basis);
}

InUseUncertainty in_use_uncertainty(const RangeApproximation& cal, const InUseTerms& t, Mass capacity) {
  InUseUncertainty r;
  r.calibration = cal;
  r.form = t.form;
  r.error_corrected = t.error_corrected;
  r.k = cal.k;
  r.capacity_g = capacity.g();
  if (!(t.required_relative > 0 && t.required_relative < 1))
    throw InputError(fmt::format("required accuracy {} % is not between 0 and 100 %.", t.required_relative * 100));
  if (!(t.safety_factor >= 1)) throw InputError(fmt::format("safety factor {} is below 1.", t.safety_factor));
  const double root12 = 2.0 * std::sqrt(3.0);
  r.terms.push_back({"rounding at zero in use", in_use_not_negative(t.rounding_zero.g(), "rounding at zero") / root12,
                     false, "EURAMET cg-18 v4.0: d_0 / (2 sqrt 3)"});
  r.terms.push_back({"rounding at load in use", in_use_not_negative(t.rounding_load.g(), "rounding at load") / root12,
                     false, "EURAMET cg-18 v4.0: d_L / (2 sqrt 3)"});
  r.terms.push_back({"repeatability in use", in_use_not_negative(t.repeatability.g(), "repeatability in use"), false,
                     "EURAMET cg-18 v4.0: s of a single reading in use, u = s"});
  r.terms.push_back({"temperature change in use",
                     in_use_not_negative(t.sensitivity_per_k, "sensitivity to temperature") *
                         in_use_not_negative(t.temperature_range_k, "temperature change") / root12,
                     true,
                     fmt::format("EURAMET cg-18 v4.0: TK dT / (2 sqrt 3), TK = {:.3g} /K, dT = {:.3g} K, rectangular",
                                 t.sensitivity_per_k, t.temperature_range_k)});
  const auto b = buoyancy::correction({1.0, t.sample_density_kg_m3,
                                       in_use_not_negative(t.sample_density_u_kg_m3, "sample density u"),
                                       buoyancy::rho_0, in_use_not_negative(t.air_density_u_kg_m3, "air density u")});
  r.terms.push_back({"buoyancy of the sample", b.u, true,
                     fmt::format("EURAMET cg-18 v4.0: sample {:.0f} kg/m3 (u {:.3g}) against the adjustment weights "
                                 "(8000 kg/m3) in air 1.2 kg/m3 (u {:.3g}); no correction applied",
                                 t.sample_density_kg_m3, t.sample_density_u_kg_m3, t.air_density_u_kg_m3)});
  r.terms.push_back({"drift since calibration", in_use_not_negative(t.drift_relative, "drift") / std::sqrt(3.0), true,
                     fmt::format("EURAMET cg-18 v4.0: D_rel / sqrt 3, D_rel = {:.3g}, rectangular", t.drift_relative)});
  double alpha2 = cal.alpha_g * cal.alpha_g, beta2 = cal.beta * cal.beta;
  for (const auto& term : r.terms) (term.relative ? beta2 : alpha2) += term.u * term.u;
  r.alpha_g = std::sqrt(alpha2);
  r.beta = std::sqrt(beta2);
  r.a_g = r.k * r.alpha_g;
  r.b = r.k * r.beta;
  if (!t.error_corrected) {
    const auto [e0, e1] = error_bound_line(cal, r.capacity_g);
    r.a_g += e0;
    r.b += e1;
  }

  const double A = t.required_relative, SF = t.safety_factor;
  if (t.form == InUseForm::linear) {
    if (SF * r.b < A) {
      const double w = SF * r.a_g / (A - SF * r.b);
      if (w <= r.capacity_g) r.minimum_weight_g = w;
    }
    r.minimum_weight_basis = fmt::format(
        "smallest W with {} U(W) / W <= {:.4g} %: W_min = SF a / (A - SF b) (USP <1251>, EURAMET cg-18 v4.0 usage)", SF,
        A * 100);
  } else {
    // SF U(W) / W falls with W over the range (U grows less than in proportion), so bisection finds the one crossing.
    const auto meets = [&](double w) { return SF * r.expanded_at(w) <= A * w; };
    if (meets(r.capacity_g)) {
      double lo = 0, hi = r.capacity_g;
      for (int i = 0; i < 200 && hi - lo > 1e-12 * r.capacity_g; ++i) {
        const double mid = 0.5 * (lo + hi);
        (meets(mid) ? hi : lo) = mid;
      }
      r.minimum_weight_g = hi;
    }
    r.minimum_weight_basis = fmt::format(
        "smallest W with {} U(W) / W <= {:.4g} %, solved by bisection (USP <1251>, EURAMET cg-18 v4.0 usage)", SF,
        A * 100);
  }
  return r;
}

}  // namespace plumb::checks
