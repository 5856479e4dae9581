#include <catch2/catch.hpp>

#include <cmath>

#include "core/errors.hpp"
#include "metrology/air_density_cipm.hpp"

using namespace plumb::density;

TEST_CASE("CIPM-2007: physical trends", "[unit][density]") {
  const double base = air_cipm2007(20, 1013.25, 50);
  // Ideal-gas scaling: rho is nearly proportional to p and to 1/T (hand: 1% more pressure, ~1% more density).
  CHECK(air_cipm2007(20, 1023.3825, 50) / base == Approx(1.01).epsilon(1e-4));
  CHECK(air_cipm2007(21, 1013.25, 50) < base);
  // Moist air is lighter than dry air (water 18 g/mol against air 29 g/mol).
  CHECK(air_cipm2007(20, 1013.25, 80) < base);
  // More CO2 (44 g/mol) makes it heavier: dM_a = 12.011 g/mol per unit mole fraction, so +0.0004 in x_CO2
  // gives +0.0048 g/mol on 28.97, a relative +1.66e-4 (hand).
  CHECK(air_cipm2007(20, 1013.25, 0, 0.0008) / air_cipm2007(20, 1013.25, 0, 0.0004) - 1 ==
        Approx(12.011 * 0.0004 / 28.96546).epsilon(0.02));
}

TEST_CASE("air density with uncertainty and validation", "[unit][density]") {
  Environment env;
  env.t_c = 20;
  env.pressure_hpa = 1000;
  env.rh_pct = 40;
  env.u_t_c = 0.1;
  env.u_pressure_hpa = 0.5;
  env.u_rh_pct = 5;
  const auto r = air_density(env);
  CHECK(r.rho == Approx(air_cipm2007(20, 1000, 40)).epsilon(1e-15));  // the same formula: equal to rounding
  // Sensitivities (R 111 C.6.3 rules of thumb, from memory): about -0.0041 kg/m3 per K, +0.00119 per hPa,
  // about -0.0001 per %RH at 20 degC.
  CHECK(r.dt == Approx(-0.0041).margin(0.0003).epsilon(0));
  CHECK(r.dp == Approx(0.00119).margin(0.00003).epsilon(0));
  CHECK(r.dh == Approx(-0.0001).margin(0.00003).epsilon(0));
  CHECK(r.u_formula == Approx(22e-6 * r.rho).epsilon(1e-15));
  CHECK(r.u > r.u_conditions);
  CHECK(r.notes.empty());

  Environment hot = env;
  hot.t_c = 30;
  CHECK_FALSE(air_density(hot).notes.empty());

  Environment bad = env;
  bad.rh_pct = 120;
  CHECK_THROWS_WITH(air_density(bad), Catch::Contains("humidity"));
  bad = env;
  bad.rh_pct = -1;
  CHECK_THROWS_AS(air_density(bad), plumb::InputError);
  bad = env;
  bad.pressure_hpa = 101325;  // Pa given where hPa is expected
  CHECK_THROWS_WITH(air_density(bad), Catch::Contains("pressure"));
  bad = env;
  bad.t_c = 80;
  CHECK_THROWS_WITH(air_density(bad), Catch::Contains("temperature"));
  bad = env;
  bad.u_pressure_hpa = -1;
  CHECK_THROWS_AS(air_density(bad), plumb::InputError);
}
