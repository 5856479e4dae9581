#include <catch2/catch.hpp>

#include <cmath>

#include "core/errors.hpp"
#include "metrology/buoyancy.hpp"
#include "support/margin.hpp"

using namespace plumb::buoyancy;
using plumb::test::grams_near;
using plumb::test::ug;

// Masses in g, held to 1e-6 ug (1e-12 g) or the hand value's last digit: far below any balance's d.

TEST_CASE("conventional mass (OIML D 28), worked by hand", "[unit][buoyancy]") {
  // A weight of density 8000 kg/m3 has conventional mass = true mass (by definition).
  CHECK_THAT(conventional_from_true(1000.0, 8000.0), grams_near(1000.0, ug(1e-6)));
  // Aluminium, 2700 kg/m3, true mass 1000 g (hand):
  //   1000 x (1 - 1.2/2700) / (1 - 1.2/8000) = 1000 x 0.99955556 / 0.99985 = 999.70551 g (999.7055113823)
  CHECK_THAT(conventional_from_true(1000.0, 2700.0), grams_near(999.7055113823, ug(0.001)));
  CHECK_THAT(true_from_conventional(conventional_from_true(1000.0, 2700.0), 2700.0), grams_near(1000.0, ug(1e-5)));
}

TEST_CASE("buoyancy correction and its uncertainty (EURAMET cg-18 form), worked by hand", "[unit][buoyancy]") {
  // Brass-like weight, 200 g conventional, rho = 8400 +/- 100 kg/m3 (standard), air 1.1 +/- 0.01 kg/m3:
  //   1/8400 - 1/8000 = -400 / 67,200,000 = -5.952381e-6 m3/kg
  //   delta_m_B = -200 x (1.1 - 1.2) x (-5.952381e-6) = -1.190476e-4 g
  //   u from air    = 200 x 5.952381e-6 x 0.01     = 1.190476e-5 g
  //   u from weight = 200 x 0.1 x 100 / 8400^2     = 2000 / 70,560,000 = 2.834467e-5 g
  //   second order  = 200 x 0.01 x 100 / 8400^2    = 200 / 70,560,000 = 2.834467e-6 g (GUM 5.1.2 note)
  //   u = sqrt(1.190476e-5^2 + 2.834467e-5^2 + 2.834467e-6^2) = 3.087358e-5 g
  const auto r = correction({200.0, 8400.0, 100.0, 1.1, 0.01});
  //   (to more digits: -1.1904761905e-4, 1.1904761905e-5, 2.8344671202e-5, 2.8344671202e-6, 3.0873580055e-5 g)
  CHECK_THAT(r.correction, grams_near(-1.1904761905e-4, ug(1e-6)));
  CHECK_THAT(r.u_from_air, grams_near(1.1904761905e-5, ug(1e-6)));
  CHECK_THAT(r.u_from_weight, grams_near(2.8344671202e-5, ug(1e-6)));
  CHECK_THAT(r.u_second_order, grams_near(2.8344671202e-6, ug(1e-6)));
  CHECK_THAT(r.u, grams_near(3.0873580055e-5, ug(1e-6)));
  // The exact force balance differs from the first-order formula by second-order terms, of relative size
  // about rho_a / rho ~ 1.4e-4 of the correction: well under 5e-4 x 1.19e-4 g = 6e-8 g.
  CHECK(std::abs(r.exact_correction - r.correction) < 6e-8);
  CHECK(std::abs(r.exact_correction - r.correction) > 0.0);
  // No correction for an 8000 kg/m3 weight, nor in air of the reference density.
  CHECK(correction({200.0, 8000.0, 0, 1.1, 0.01}).correction == 0.0);
  CHECK(correction({200.0, 7950.0, 0, 1.2, 0.0}).correction == 0.0);
  CHECK_THAT(indication_for(200.0, 8000.0, 1.1), grams_near(200.0, ug(1e-7)));
}

TEST_CASE("buoyancy of a weight of 8000 kg/m3 with an uncertain density is not zero, worked by hand",
          "[unit][buoyancy]") {
  // EURAMET cg-18 v4.0 7.1.2.2 with the GUM 5.1.2 second-order term: 100 g, rho = 8000 kg/m3 with u(rho) from
  // OIML R 111-1:2004 Table 5, class E2, >= 100 g: 7810 to 8210 kg/m3 (from memory); the larger distance from
  // 8000 is 210 kg/m3, u = 210 / sqrt 3 = 121.2435565 kg/m3;
  // air measured at 1.2 kg/m3 with u = 0.0005 kg/m3.
  //   1/rho - 1/rho_c = 0 and rho_a - rho_0 = 0: both first-order terms vanish, the correction is 0;
  //   second order = 100 x 0.0005 x 121.2435565 / 8000^2 = 6.0621778 / 64,000,000 = 9.4721528e-8 g.
  const auto r = correction({100.0, 8000.0, 210.0 / std::sqrt(3.0), 1.2, 0.0005});
  CHECK(r.correction == 0.0);
  CHECK(r.u_from_air == 0.0);
  CHECK(r.u_from_weight == 0.0);
  CHECK_THAT(r.u, grams_near(9.4721528e-8, ug(1e-7)));
}

TEST_CASE("buoyancy: bad input", "[unit][buoyancy]") {
  CHECK_THROWS_WITH(correction({200.0, 0.0, 0, 1.2, 0}), Catch::Contains("density"));
  CHECK_THROWS_WITH(correction({200.0, 8000.0, 0, 12.0, 0}), Catch::Contains("air density"));
  CHECK_THROWS_AS(correction({-1.0, 8000.0, 0, 1.2, 0}), plumb::InputError);
  CHECK_THROWS_AS(correction({1.0, 8000.0, -5, 1.2, 0}), plumb::InputError);
}
