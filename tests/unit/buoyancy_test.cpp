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
  //   u = sqrt(1.190476e-5^2 + 2.834467e-5^2)      = 3.074319e-5 g
  const auto r = correction({200.0, 8400.0, 100.0, 1.1, 0.01});
  //   (to more digits: -1.1904761905e-4, 1.1904761905e-5, 2.8344671202e-5, 3.0743190165e-5 g)
  CHECK_THAT(r.correction, grams_near(-1.1904761905e-4, ug(1e-6)));
  CHECK_THAT(r.u_from_air, grams_near(1.1904761905e-5, ug(1e-6)));
  CHECK_THAT(r.u_from_weight, grams_near(2.8344671202e-5, ug(1e-6)));
  CHECK_THAT(r.u, grams_near(3.0743190165e-5, ug(1e-6)));
  // The exact force balance differs from the first-order formula by second-order terms, of relative size
  // about rho_a / rho ~ 1.4e-4 of the correction: well under 5e-4 x 1.19e-4 g = 6e-8 g.
  CHECK(std::abs(r.exact_correction - r.correction) < 6e-8);
  CHECK(std::abs(r.exact_correction - r.correction) > 0.0);
  // No correction for an 8000 kg/m3 weight, nor in air of the reference density.
  CHECK(correction({200.0, 8000.0, 0, 1.1, 0.01}).correction == 0.0);
  CHECK(correction({200.0, 7950.0, 0, 1.2, 0.0}).correction == 0.0);
  CHECK_THAT(indication_for(200.0, 8000.0, 1.1), grams_near(200.0, ug(1e-7)));
}

TEST_CASE("buoyancy: bad input", "[unit][buoyancy]") {
  CHECK_THROWS_WITH(correction({200.0, 0.0, 0, 1.2, 0}), Catch::Contains("density"));
  CHECK_THROWS_WITH(correction({200.0, 8000.0, 0, 12.0, 0}), Catch::Contains("air density"));
  CHECK_THROWS_AS(correction({-1.0, 8000.0, 0, 1.2, 0}), plumb::InputError);
  CHECK_THROWS_AS(correction({1.0, 8000.0, -5, 1.2, 0}), plumb::InputError);
}
