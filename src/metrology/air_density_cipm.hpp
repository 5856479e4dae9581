#pragma once
// Air density from the laboratory's environment.
// - CIPM-2007 equation: A. Picard, R. S. Davis, M. Glaeser, K. Fujii, "Revised formula for the density of
//   moist air (CIPM-2007)", Metrologia 45 (2008) 149-155. Relative standard uncertainty of the equation
//   itself 22e-6; stated for 600 hPa <= p <= 1100 hPa, 15 degC <= t <= 27 degC, 0 <= h <= 100 %.
// - OIML R 111-1:2004 Annex E approximation (density.hpp), relative uncertainty about 2e-4 in the same
//   conditions (R 111 E.3).
// The environment is validated first: humidity outside 0-100 % or a pressure outside 500-1100 hPa is
// refused with an InputError naming the field.
#include <string>
#include <string_view>
#include <vector>

namespace plumb::density {

/// Conditions of a weighing. Pressure in hPa, humidity in % RH, temperature in degC.
struct Environment {
  double t_c = 20.0;
  double pressure_hpa = 1013.25;
  double rh_pct = 50.0;
  double x_co2 = 0.0004;  ///< CO2 mole fraction (CIPM-2007 only)
  /// Standard uncertainties of the measured conditions (of the thermometer, barometer, hygrometer).
  double u_t_c = 0.0;
  double u_pressure_hpa = 0.0;
  double u_rh_pct = 0.0;
};

/// Plausible ranges accepted as input (wider than the equations' validity ranges, which produce notes).
inline constexpr double min_pressure_hpa = 500.0, max_pressure_hpa = 1100.0;
inline constexpr double min_t_c = 0.0, max_t_c = 40.0;
inline constexpr double max_x_co2 = 0.01;

/// Throws InputError naming the field (temperature, pressure, humidity, CO2 mole fraction, or an uncertainty).
void validate(const Environment& env);

/// CIPM-2007 air density in kg/m3 (no validation: see air_density()).
double air_cipm2007(double t_c, double pressure_hpa, double rh_pct, double x_co2 = 0.0004);

enum class AirFormula { cipm2007, oiml_r111 };
std::string_view to_string(AirFormula f);
/// Relative standard uncertainty of the equation itself.
double formula_relative_uncertainty(AirFormula f);

struct AirDensity {
  AirFormula formula = AirFormula::cipm2007;
  double rho = 0.0;          ///< kg/m3
  double u_formula = 0.0;    ///< standard uncertainty from the equation, kg/m3
  double u_conditions = 0.0; ///< from u(t), u(p), u(h), by numerical sensitivity coefficients, kg/m3
  double u = 0.0;            ///< combined standard uncertainty, kg/m3
  double dt = 0.0, dp = 0.0, dh = 0.0;  ///< sensitivity coefficients d rho / dt (per K), / dp (per hPa), / dh (per %RH)
  std::vector<std::string> notes;       ///< e.g. outside the equation's validity range
};

/// Validates `env`, then evaluates `formula` with its uncertainty.
AirDensity air_density(const Environment& env, AirFormula formula = AirFormula::cipm2007);

}  // namespace plumb::density
