#include "checks/pipette_uncertainty.hpp"

#include <fmt/format.h>

#include <cmath>
#include <vector>

#include "core/errors.hpp"
#include "metrology/density.hpp"

namespace plumb::checks {
namespace {

double z_at(double t_c, const gravimetric::Environment& env, double weight_density) {
  return gravimetric::z_from_densities(
      density::water_tanaka(t_c), density::air_oiml_r111(t_c, env.air_pressure_hpa, env.humidity_pct), weight_density);
}

double entered_u(std::optional<double> v, double fallback, const char* field, const char* unit) {
  if (!v) return fallback;
  if (!std::isfinite(*v) || *v < 0)
    throw InputError(fmt::format("{} {} {} is not a standard uncertainty (it must be zero or more).", field, *v, unit));
  return *v;
}

}  // namespace

double z_temperature_slope(const gravimetric::Environment& env) {
  constexpr double step_c = 0.01;
  const double rho_b = density::conventional_weight_kg_m3;
  const double t = env.water_temperature_c;
  return (z_at(t + step_c, env, rho_b) - z_at(t - step_c, env, rho_b)) / (2 * step_c);
}

PipetteUncertainty pipette_uncertainty(const PipetteMeanInputs& in, const PipetteUncertaintyOptions& options) {
  if (in.n < 2) throw InputError(fmt::format("weighings: {} given; an uncertainty needs at least two.", in.n));
  const double u_t = entered_u(options.water_temperature_u_c, default_thermometer_half_width_c / std::sqrt(3.0),
                               "water temperature uncertainty", "degC");
  const double u_rho_a =
      entered_u(options.air_density_u_kg_m3, default_air_density_u_kg_m3, "air density uncertainty", "kg/m3");
  const double n = static_cast<double>(in.n);
  const double z = in.z.z_ul_per_mg, m = in.mean_mass.mg();
  const double rho_w = in.z.water_density_kg_m3, rho_a = in.z.air_density_kg_m3, rho_b = in.z.weight_density_kg_m3;
  // Z = 1000 (1 - rho_a / rho_b) / (rho_w - rho_a): the partial derivatives of that formula.
  const double dz_drho_w = -z / (rho_w - rho_a);
  const double dz_drho_a = z / (rho_w - rho_a) - 1000.0 / (rho_b * (rho_w - rho_a));

  std::vector<stats::Contribution> inputs;
  inputs.push_back(stats::Contribution::type_a("repeatability of the mean, s_r / sqrt(n)",
                                               in.random_error.ul() / std::sqrt(n), n - 1.0));
  if (in.balance_u) {
    inputs.push_back(stats::Contribution::standard("balance calibration, u of a weighing", in.balance_u->mg(), z));
    inputs.back().note = in.balance_u_basis;
  }
  if (!in.balance_u || !in.balance_u_includes_rounding) {
    inputs.push_back(stats::Contribution::rounding("balance readability d", in.readability.mg(), z));
    if (!in.balance_u)
      inputs.back().note =
          (in.no_balance_u_reason.empty() ? std::string("no balance calibration given") : in.no_balance_u_reason) +
          ": the readability alone stands for the balance (fallback)";
  }
  inputs.push_back(
      stats::Contribution::standard("water temperature (thermometer)", u_t, m * z_temperature_slope(in.environment)));
  inputs.back().note = options.water_temperature_u_c
                           ? "entered"
                           : "default: ISO 8655-6:2002 thermometer maximum error 0.2 degC, rectangular";
  inputs.push_back(stats::Contribution::standard("air density", u_rho_a, m * dz_drho_a));
  inputs.back().note = options.air_density_u_kg_m3 ? "entered" : "default: 0.01 kg/m3";
  if (in.evaporation)
    inputs.push_back(stats::Contribution::rectangular("evaporation correction", in.evaporation->mg(), z));
  inputs.push_back(
      stats::Contribution::standard("Z factor: water density formula", water_density_formula_u_kg_m3, m * dz_drho_w));
  stats::BudgetOptions bo;
  bo.fixed_k = pipette_coverage_k;

  PipetteUncertainty u;
  u.budget = stats::combine("mean volume", "uL", std::move(inputs), bo);
  u.systematic_expanded = Volume::microlitres(u.budget.expanded);
  u.systematic_expanded_pct = 100.0 * u.budget.expanded / in.selected.ul();
  u.random_expanded = Volume::microlitres(pipette_coverage_k * in.random_error.ul() / std::sqrt(2.0 * (n - 1.0)));
  const double mean_ul = z * m;
  u.cv_expanded_pct = mean_ul > 0 ? 100.0 * u.random_expanded.ul() / mean_ul : 0.0;
  return u;
}

}  // namespace plumb::checks
