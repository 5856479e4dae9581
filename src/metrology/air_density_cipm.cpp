#include "metrology/air_density_cipm.hpp"

#include <fmt/format.h>

#include <cmath>

#include "core/errors.hpp"
#include "metrology/density.hpp"

namespace plumb::density {

namespace {
bool finite(double v) { return std::isfinite(v); }
}  // namespace

void validate(const Environment& env) {
  if (!finite(env.t_c) || env.t_c < min_t_c || env.t_c > max_t_c)
    throw InputError(fmt::format("temperature: {} degC is outside the plausible range {} to {} degC.", env.t_c,
                                 min_t_c, max_t_c));
  if (!finite(env.pressure_hpa) || env.pressure_hpa < min_pressure_hpa || env.pressure_hpa > max_pressure_hpa)
    throw InputError(fmt::format("pressure: {} hPa is outside the plausible range {} to {} hPa.", env.pressure_hpa,
                                 min_pressure_hpa, max_pressure_hpa));
  if (!finite(env.rh_pct) || env.rh_pct < 0.0 || env.rh_pct > 100.0)
    throw InputError(fmt::format("humidity: {} % RH is outside 0 to 100 %.", env.rh_pct));
  if (!finite(env.x_co2) || env.x_co2 < 0.0 || env.x_co2 > max_x_co2)
    throw InputError(fmt::format("CO2 mole fraction: {} is outside 0 to {}.", env.x_co2, max_x_co2));
  if (!finite(env.u_t_c) || env.u_t_c < 0.0)
    throw InputError(fmt::format("temperature uncertainty: {} is not a non-negative number.", env.u_t_c));
  if (!finite(env.u_pressure_hpa) || env.u_pressure_hpa < 0.0)
    throw InputError(fmt::format("pressure uncertainty: {} is not a non-negative number.", env.u_pressure_hpa));
  if (!finite(env.u_rh_pct) || env.u_rh_pct < 0.0)
    throw InputError(fmt::format("humidity uncertainty: {} is not a non-negative number.", env.u_rh_pct));
}

double air_cipm2007(double t_c, double pressure_hpa, double rh_pct, double x_co2) {
  // Picard et al. 2008, equations (1), (A1.1)-(A1.4); constants as published there.
  constexpr double R = 8.314472;          // J mol^-1 K^-1 (as used in CIPM-2007)
  constexpr double Mv = 18.01528e-3;      // kg/mol, water
  const double Ma = (28.96546 + 12.011 * (x_co2 - 0.0004)) * 1e-3;  // kg/mol, dry air
  const double T = t_c + 273.15;
  const double p = pressure_hpa * 100.0;  // Pa
  const double h = rh_pct / 100.0;
  // Saturation vapour pressure (A1.1).
  constexpr double A = 1.2378847e-5, B = -1.9121316e-2, C = 33.93711047, D = -6.3431645e3;
  const double psv = std::exp(A * T * T + B * T + C + D / T);
  // Enhancement factor (A1.2).
  constexpr double alpha = 1.00062, beta = 3.14e-8, gamma = 5.6e-7;
  const double f = alpha + beta * p + gamma * t_c * t_c;
  const double xv = h * f * psv / p;
  // Compressibility factor (A1.3).
  constexpr double a0 = 1.58123e-6, a1 = -2.9331e-8, a2 = 1.1043e-10, b0 = 5.707e-6, b1 = -2.051e-8,
                   c0 = 1.9898e-4, c1 = -2.376e-6, d = 1.83e-11, e = -0.765e-8;
  const double Z = 1.0 - p / T * (a0 + a1 * t_c + a2 * t_c * t_c + (b0 + b1 * t_c) * xv + (c0 + c1 * t_c) * xv * xv) +
                   p * p / (T * T) * (d + e * xv * xv);
  return p * Ma / (Z * R * T) * (1.0 - xv * (1.0 - Mv / Ma));
}

std::string_view to_string(AirFormula f) {
  return f == AirFormula::cipm2007 ? "CIPM-2007 (Picard et al., Metrologia 45 (2008) 149)"
                                   : "OIML R 111-1:2004 Annex E approximation";
}

double formula_relative_uncertainty(AirFormula f) { return f == AirFormula::cipm2007 ? 22e-6 : 2e-4; }

AirDensity air_density(const Environment& env, AirFormula formula) {
  validate(env);
  const auto rho = [&](double t, double p, double h) {
    return formula == AirFormula::cipm2007 ? air_cipm2007(t, p, h, env.x_co2) : air_oiml_r111(t, p, h);
  };
  AirDensity r;
  r.formula = formula;
  r.rho = rho(env.t_c, env.pressure_hpa, env.rh_pct);
  // Central differences; steps small against the ranges, large against rounding.
  r.dt = (rho(env.t_c + 0.01, env.pressure_hpa, env.rh_pct) - rho(env.t_c - 0.01, env.pressure_hpa, env.rh_pct)) / 0.02;
  r.dp = (rho(env.t_c, env.pressure_hpa + 0.1, env.rh_pct) - rho(env.t_c, env.pressure_hpa - 0.1, env.rh_pct)) / 0.2;
  r.dh = (rho(env.t_c, env.pressure_hpa, env.rh_pct + 0.1) - rho(env.t_c, env.pressure_hpa, env.rh_pct - 0.1)) / 0.2;
  r.u_formula = formula_relative_uncertainty(formula) * r.rho;
  r.u_conditions = std::sqrt(std::pow(r.dt * env.u_t_c, 2) + std::pow(r.dp * env.u_pressure_hpa, 2) +
                             std::pow(r.dh * env.u_rh_pct, 2));
  r.u = std::hypot(r.u_formula, r.u_conditions);
  if (env.pressure_hpa < 600.0 || env.t_c < 15.0 || env.t_c > 27.0)
    r.notes.push_back(fmt::format("conditions (t = {} degC, p = {} hPa) are outside the range the {} was stated "
                                  "for (600-1100 hPa, 15-27 degC); its own uncertainty may be larger",
                                  env.t_c, env.pressure_hpa, to_string(formula)));
  return r;
}

}  // namespace plumb::density
