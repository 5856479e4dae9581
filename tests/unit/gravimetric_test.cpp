// The ISO 8655-6 conversion factor Z = (1/(rho_w - rho_a)) (1 - rho_a/rho_b), rho_b = 8000 kg/m3, in uL/mg,
// and the method's range of conditions. Reference values against the CSV are in
// tests/reference/water_air_density_test.cpp; here the formula is checked with densities worked by hand.
#include <catch2/catch.hpp>

#include "core/errors.hpp"
#include "metrology/gravimetric.hpp"

using Catch::Matchers::Contains;
namespace g = plumb::gravimetric;

TEST_CASE("Z from densities, worked by hand from the ISO 8655-6 formula", "[gravimetric]") {
  // No air: Z = 1000 / 1000 * (1 - 0) = 1 uL/mg exactly.
  CHECK(g::z_from_densities(1000.0, 0.0, 8000.0) == 1.0);
  // rho_w = 998.2067, rho_a = 1.2 (OIML D 28 conventional air), rho_b = 8000:
  //   rho_w - rho_a = 997.0067; 1000 / 997.0067 = 1.0030023; 1 - 1.2/8000 = 1 - 0.00015 = 0.99985;
  //   Z = 1.0030023 * 0.99985 = 1.0028518 uL/mg.
  CHECK(g::z_from_densities(998.2067, 1.2, 8000.0) == Approx(1.0028518).margin(1e-7).epsilon(0));
  // rho_w = 1000, rho_a = 1.2: 1000 / 998.8 = 1.0012014; * 0.99985 = 1.0010513.
  CHECK(g::z_from_densities(1000.0, 1.2, 8000.0) == Approx(1.0010513).margin(1e-7).epsilon(0));
}

TEST_CASE("z_factor reports the densities it used", "[gravimetric]") {
  const auto z = g::z_factor({20.0, 1013.25, 50.0});
  CHECK(z.weight_density_kg_m3 == 8000.0);
  CHECK(z.water_density_kg_m3 == Approx(998.2067).margin(0.00005).epsilon(0));  // Tanaka et al. 2001 at 20 degC
  CHECK(z.air_density_kg_m3 ==
        Approx(1.19929).margin(0.000005).epsilon(0));  // water-and-air-density.csv row at 20 degC
  // By hand from those two: 998.2067 - 1.19929 = 997.00741; 1000 / 997.00741 = 1.0030016;
  // 1 - 1.19929 / 8000 = 0.99985009; Z = 1.0030016 * 0.99985009 = 1.0028512 uL/mg.
  CHECK(z.z_ul_per_mg == Approx(1.0028512).margin(0.0000002).epsilon(0));
}

TEST_CASE("Z rises with temperature across the method's range (water expands)", "[gravimetric]") {
  double previous = 0.0;
  for (int tenths = 150; tenths <= 300; tenths += 5) {
    const double z = g::z_factor({tenths / 10.0, 1013.0, 50.0}).z_ul_per_mg;
    INFO("t = " << tenths / 10.0);
    CHECK(z > previous);
    previous = z;
  }
}

TEST_CASE("Conditions outside the method are refused naming the field and value", "[gravimetric][bad-input]") {
  CHECK_NOTHROW(g::z_factor({15.0, 1013.0, 50.0}));
  CHECK_NOTHROW(g::z_factor({30.0, 1013.0, 50.0}));
  CHECK_THROWS_AS(g::z_factor({14.9, 1013.0, 50.0}), plumb::InputError);
  CHECK_THROWS_WITH(g::z_factor({14.9, 1013.0, 50.0}),
                    Contains("water temperature 14.9 degC") && Contains("15 degC to 30 degC"));
  CHECK_THROWS_WITH(g::z_factor({30.5, 1013.0, 50.0}), Contains("water temperature 30.5 degC"));
  // 101.3 is kPa typed where hPa is asked.
  CHECK_THROWS_WITH(g::z_factor({20.0, 101.3, 50.0}), Contains("air pressure 101.3 hPa") && Contains("hPa"));
  CHECK_THROWS_WITH(g::z_factor({20.0, 1013.0, 120.0}), Contains("humidity 120"));
  CHECK_THROWS_WITH(g::z_factor({20.0, 1013.0, -1.0}), Contains("humidity -1"));
}

TEST_CASE("Humidity below 50 % is a note, not a refusal", "[gravimetric]") {
  CHECK(g::environment_notes({20.0, 1013.0, 50.0}).empty());
  const auto notes = g::environment_notes({20.0, 1013.0, 35.0});
  REQUIRE(notes.size() == 1);
  CHECK_THAT(notes[0], Contains("35 %"));
}
