// Run conditions and a weight's density are typed with their units (src/core/condition_units.hpp). The
// conversions are exact powers of ten (1 kPa = 10 hPa, 1 hPa = 1 mbar, 1 g/cm3 = 1000 kg/m3: SI prefixes).
#include <catch2/catch.hpp>

#include "core/condition_units.hpp"
#include "core/errors.hpp"

using namespace plumb;

TEST_CASE("conditions are read with their units and converted exactly", "[condition_units]") {
  CHECK(parse_celsius("20.5C", "--water-temp") == Decimal::parse("20.5"));
  CHECK(parse_celsius("20.5 degC", "--water-temp") == Decimal::parse("20.5"));
  CHECK(parse_celsius("20.5 \xC2\xB0"
                      "C",
                      "--water-temp") == Decimal::parse("20.5"));
  CHECK(parse_celsius("-5C", "--temperature") == Decimal::parse("-5"));
  CHECK(parse_hectopascals("1013.25hPa", "--pressure") == Decimal::parse("1013.25"));
  CHECK(parse_hectopascals("1013 mbar", "--pressure") == Decimal::parse("1013"));
  CHECK(parse_hectopascals("101.325kPa", "--pressure") == Decimal::parse("1013.25"));
  CHECK(parse_percent_rh("45%", "--humidity") == Decimal::parse("45"));
  CHECK(parse_percent_rh("45 %RH", "--humidity") == Decimal::parse("45"));
  CHECK(parse_kg_per_cubic_metre("7950kg/m3", "--density") == Decimal::parse("7950"));
  CHECK(parse_kg_per_cubic_metre("7.95 g/cm3", "--density") == Decimal::parse("7950"));
}

TEST_CASE("a condition without its unit, or in another quantity's unit, is refused", "[condition_units]") {
  CHECK_THROWS_WITH(parse_celsius("20.5", "--water-temp"),
                    "--water-temp \"20.5\" has no unit; write it with its unit, e.g. 20.5C.");
  CHECK_THROWS_WITH(parse_hectopascals("1013", "--pressure"), Catch::Contains("e.g. 1013hPa"));
  CHECK_THROWS_WITH(parse_percent_rh("45", "--humidity"), Catch::Contains("e.g. 45%"));
  CHECK_THROWS_WITH(parse_kg_per_cubic_metre("8000", "--density"), Catch::Contains("e.g. 8000kg/m3"));
  CHECK_THROWS_WITH(parse_celsius("293K", "--temperature"), Catch::Contains("not end in a unit of temperature"));
  CHECK_THROWS_WITH(parse_hectopascals("1013%", "--pressure"), Catch::Contains("hPa, mbar or kPa"));
  CHECK_THROWS_WITH(parse_percent_rh("45C", "--humidity"), Catch::Contains("% or %RH"));
  CHECK_THROWS_WITH(parse_celsius("warm", "--temperature"), Catch::Contains("is not a temperature"));
  CHECK_THROWS_AS(parse_celsius("2.0.5C", "--temperature"), InputError);
}
