#include <catch2/catch.hpp>

#include "core/errors.hpp"
#include "core/units.hpp"

using namespace plumb;

TEST_CASE("masses convert exactly between units", "[units]") {
  CHECK(ExactMass::parse("0.1mg", "d").in_grams() == Decimal::parse("0.0001"));
  CHECK(ExactMass::parse("220 g", "cap").in_grams() == Decimal::parse("220"));
  CHECK(ExactMass::parse("2kg", "cap").in_grams() == Decimal::parse("2000"));
  CHECK(ExactMass::parse("5ug", "x").in_grams() == Decimal::parse("0.000005"));
  CHECK(ExactMass::parse("100", "x", MassUnit::mg).in_grams() == Decimal::parse("0.1"));  // a documented default
  CHECK(ExactMass::parse("0.03mg", "c").to_string() == "0.03 mg");
  CHECK(ExactMass::parse("100g", "n").to_string() == "100 g");
  CHECK(ExactMass::parse("0.1mg", "d").to_string() == "0.1 mg");
}

TEST_CASE("a mass without its unit is refused, naming the field and both likely units", "[units]") {
  // "0.03" taken as grams would be 0.03 g, 1000 times the 0.03 mg that was meant (issue 13).
  CHECK_THROWS_WITH(ExactMass::parse("0.03", "--correction"),
                    "--correction \"0.03\" has no unit; write it with its unit, e.g. 0.03mg or 0.03g.");
  CHECK_THROWS_AS(ExactMass::parse("-0.02", "--correction"), InputError);
  CHECK(ExactMass::parse("-0.02 mg", "--correction").in_grams() == Decimal::parse("-0.00002"));
}

TEST_CASE("units that are not masses are refused", "[units]") {
  CHECK_THROWS_AS(ExactMass::parse("100mL", "--nominal"), InputError);
  CHECK_THROWS_AS(parse_mass_unit("lb", "unit"), InputError);
  CHECK_THROWS_WITH(parse_mass_unit("uL", "line 3 column unit: value"), Catch::Contains("not a unit of mass"));
  CHECK(parse_volume_unit("mL") == VolumeUnit::ml);
  CHECK_THROWS_AS(parse_volume_unit("mg"), InputError);
}
