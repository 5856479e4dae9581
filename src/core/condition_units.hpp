#pragma once
// Quantities other than masses and volumes as people type them, each with its unit like a mass: the run
// conditions ("20.5C", "1013hPa", "50%") and a weight's density ("8000kg/m3"). A bare number is refused, so that
// a value can never be read in a unit it was not meant in.
#include <string_view>

#include "core/decimal.hpp"

namespace plumb {

/// Degrees Celsius: "20.5C", "20.5 degC", "20.5 \u00B0C". Returns the number of degrees, exact as typed.
Decimal parse_celsius(std::string_view text, std::string_view field);
/// Hectopascals: "1013hPa", "1013 mbar" (the same unit), "101.3kPa" (converted exactly). Returns hPa.
Decimal parse_hectopascals(std::string_view text, std::string_view field);
/// Relative humidity in percent: "50%", "50 %RH". Returns the percentage.
Decimal parse_percent_rh(std::string_view text, std::string_view field);
/// Density in kg/m3: "8000kg/m3", "8000 kg/m^3", "7.95g/cm3" (converted exactly). Returns kg/m3.
Decimal parse_kg_per_cubic_metre(std::string_view text, std::string_view field);

}  // namespace plumb
