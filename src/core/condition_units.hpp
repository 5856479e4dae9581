#pragma once
// Run conditions as people type them, each with its unit, like a mass: "20.5C", "1013hPa", "50%". A bare
// number is refused, so that a temperature can never be taken for a pressure or a humidity in another unit.
#include <string_view>

#include "core/decimal.hpp"

namespace plumb {

/// Degrees Celsius: "20.5C", "20.5 degC", "20.5 \u00B0C". Returns the number of degrees, exact as typed.
Decimal parse_celsius(std::string_view text, std::string_view field);
/// Hectopascals: "1013hPa", "1013 mbar" (the same unit), "101.3kPa" (converted exactly). Returns hPa.
Decimal parse_hectopascals(std::string_view text, std::string_view field);
/// Relative humidity in percent: "50%", "50 %RH". Returns the percentage.
Decimal parse_percent_rh(std::string_view text, std::string_view field);

}  // namespace plumb
