#pragma once
// The gravimetric method of ISO 8655-6 for piston pipettes: a weighing of dispensed water is turned
// into a volume with the conversion factor Z,
//   Z = (1 / (rho_w - rho_a)) * (1 - rho_a / rho_b),  rho_b = 8000 kg/m3 (the balance's weights),
// with rho_w from Tanaka et al. (2001) and rho_a from the OIML R 111-1 Annex E approximation
// (metrology/density.hpp). With densities in kg/m3, 1 m3/kg = 1000 uL/mg, so Z in uL/mg is
// 1000 / (rho_w - rho_a) * (1 - rho_a / rho_b).
//
// One temperature is used for both water and air: the method asks for the water, the air and the
// balance to be in equilibrium, and the ISO 8655-6 Annex A table is tabulated against one temperature.
#include <string>
#include <vector>

namespace plumb::gravimetric {

/// The method's temperature range (ISO 8655-6: 15 degC to 30 degC).
inline constexpr double min_water_temperature_c = 15.0;
inline constexpr double max_water_temperature_c = 30.0;
/// Plausible air pressure in a laboratory (sea level to about 3500 m altitude); outside is a typing slip.
inline constexpr double min_pressure_hpa = 600.0;
inline constexpr double max_pressure_hpa = 1100.0;
/// ISO 8655-6 asks for a relative humidity above 50 % in the test room (as remembered): below it,
/// evaporation grows; this is a note on the result, not a refusal.
inline constexpr double recommended_min_humidity_pct = 50.0;

/// The conditions of a gravimetric run as measured (water temperature, air pressure, relative humidity).
struct Environment {
  double water_temperature_c = 20.0;
  double air_pressure_hpa = 1013.25;
  double humidity_pct = 50.0;
};

/// Z and the densities it was computed from, for a certificate to print.
struct ZFactor {
  double water_density_kg_m3 = 0.0;  ///< Tanaka et al. (2001)
  double air_density_kg_m3 = 0.0;    ///< OIML R 111-1 Annex E
  double weight_density_kg_m3 = 0.0; ///< rho_b, 8000 kg/m3
  double z_ul_per_mg = 0.0;
};

/// The bare formula: Z in uL/mg from densities in kg/m3. No range checks.
double z_from_densities(double water_kg_m3, double air_kg_m3, double weight_kg_m3);

/// Throws InputError naming the field and value when the water temperature is outside 15-30 degC,
/// the pressure outside 600-1100 hPa, or the humidity outside 0-100 %.
void validate(const Environment& env);

/// Z for the run's conditions; validates them first (see validate()).
ZFactor z_factor(const Environment& env);

/// Observations about the conditions that do not refuse the run (e.g. humidity below 50 %).
std::vector<std::string> environment_notes(const Environment& env);

}  // namespace plumb::gravimetric
