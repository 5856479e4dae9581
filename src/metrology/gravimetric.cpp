#include "metrology/gravimetric.hpp"

#include <fmt/format.h>

#include <cmath>

#include "core/errors.hpp"
#include "metrology/density.hpp"

namespace plumb::gravimetric {

double z_from_densities(double water_kg_m3, double air_kg_m3, double weight_kg_m3) {
  // 1 / (kg/m3) = m3/kg; 1 m3 = 1e9 uL and 1 kg = 1e6 mg, so m3/kg * 1000 = uL/mg.
  return 1000.0 / (water_kg_m3 - air_kg_m3) * (1.0 - air_kg_m3 / weight_kg_m3);
}

void validate(const Environment& env) {
  const double t = env.water_temperature_c;
  if (!std::isfinite(t) || t < min_water_temperature_c || t > max_water_temperature_c)
    throw InputError(fmt::format("water temperature {} degC is outside the range of the gravimetric method "
                                 "(ISO 8655-6: {} degC to {} degC).",
                                 t, min_water_temperature_c, max_water_temperature_c));
  const double p = env.air_pressure_hpa;
  if (!std::isfinite(p) || p < min_pressure_hpa || p > max_pressure_hpa)
    throw InputError(fmt::format("air pressure {} hPa is not a plausible laboratory pressure ({} hPa to {} hPa); "
                                 "give the pressure in hPa.",
                                 p, min_pressure_hpa, max_pressure_hpa));
  const double h = env.humidity_pct;
  if (!std::isfinite(h) || h < 0.0 || h > 100.0)
    throw InputError(fmt::format("humidity {} %RH is not a relative humidity (0 % to 100 %).", h));
}

ZFactor z_factor(const Environment& env) {
  validate(env);
  ZFactor z;
  z.water_density_kg_m3 = density::water_tanaka(env.water_temperature_c);
  z.air_density_kg_m3 = density::air_oiml_r111(env.water_temperature_c, env.air_pressure_hpa, env.humidity_pct);
  z.weight_density_kg_m3 = density::conventional_weight_kg_m3;
  z.z_ul_per_mg = z_from_densities(z.water_density_kg_m3, z.air_density_kg_m3, z.weight_density_kg_m3);
  return z;
}

std::vector<std::string> environment_notes(const Environment& env) {
  std::vector<std::string> notes;
  if (env.humidity_pct < recommended_min_humidity_pct)
    notes.push_back(
        fmt::format("Relative humidity {} % is below the {} % ISO 8655-6:2002 asks for; "
                    "evaporation during weighing is larger than the method assumes.",
                    env.humidity_pct, recommended_min_humidity_pct));
  return notes;
}

}  // namespace plumb::gravimetric
