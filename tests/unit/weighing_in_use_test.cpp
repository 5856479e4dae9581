// The uncertainty of a weighing result in use and the minimum weight from it (EURAMET cg-18 v4.0, uncertainty
// of a weighing result; USP <1251> / cg-18 usage of a safety factor), worked by hand. The term list and the
// d / (2 sqrt 3), TK dT / (2 sqrt 3) and D / sqrt 3 forms are cg-18's as recalled from memory; the buoyancy
// term is metrology/buoyancy's formula (cg-18 v4.0) with rho_a = rho_0 = 1.2 kg/m3.
#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include "checks/weighing_in_use.hpp"
#include "core/errors.hpp"
#include "support/margin.hpp"

using plumb::Mass;
using plumb::test::grams_near;
using plumb::test::mg;
using plumb::test::ug;
namespace ck = plumb::checks;

namespace {
// The calibration of range_approximation_test's first case: E = 2e-6 R, alpha_E = 0.1 mg, beta_E = 1e-6, k = 2.
ck::RangeApproximation calibration() {
  std::vector<ck::ApproximationPoint> p;
  for (double r : {50.0, 100.0, 150.0, 200.0, 250.0}) p.push_back({r, 2e-6 * r, std::sqrt(1e-8 + 1e-12 * r * r), 2.0});
  return ck::approximate_over_range(p, plumb::stats::Model::through_origin);
}
ck::InUseTerms terms() {
  ck::InUseTerms t;
  t.rounding_zero = Mass::milligrams(0.1);
  t.rounding_load = Mass::milligrams(0.1);
  t.repeatability = Mass::milligrams(0.1);
  t.temperature_range_k = 5;
  t.sensitivity_per_k = 2e-6;
  t.sample_density_kg_m3 = 1000;
  t.sample_density_u_kg_m3 = 50;
  t.air_density_u_kg_m3 = 0.05;
  t.drift_relative = 1e-5;
  t.required_relative = 0.001;
  t.safety_factor = 2;
  return t;
}
}  // namespace

TEST_CASE("in-use uncertainty and minimum weight, linear form, by hand", "[unit][uncertainty][in-use]") {
  // Absolute: alpha^2 = 0.1^2 (calibration) + 2 x (0.1 / (2 sqrt 3))^2 (rounding at zero, at load) + 0.1^2
  // (repeatability) = 0.01 + 0.00166667 + 0.01 = 0.02166667 mg^2, alpha = 0.14719601 mg.
  // Relative: temperature 2e-6 x 5 / (2 sqrt 3) = 2.88675e-6; buoyancy sqrt((1/1000 - 1/8000)^2 x 0.05^2 +
  // 0.05^2 x 50^2 / 1000^4) = sqrt((4.375e-5)^2 + (2.5e-6)^2) = 4.382137e-5; drift 1e-5 / sqrt 3 = 5.7735e-6;
  // beta^2 = 1e-12 + 8.3333e-12 + 1.9203125e-9 + 3.3333e-11 = 1.96297917e-9, beta = 4.4305521e-5.
  // Corrected, k = 2: a = 0.29439203 mg, b = 8.8611041e-5; W_min = 2 x 0.29439203 mg / (0.001 - 2 x 8.8611041e-5)
  // = 0.58878406 mg / 8.2277792e-4 = 0.71560508 g.
  auto t = terms();
  t.error_corrected = true;
  const auto u = ck::in_use_uncertainty(calibration(), t, Mass::grams(250));
  CHECK_THAT(u.alpha_g, grams_near(1.4719601e-4, ug(0.001)));
  CHECK(u.beta == Approx(4.4305521e-5).margin(1e-12).epsilon(0));
  CHECK(u.terms.at(4).u == Approx(4.382137e-5).margin(1e-11).epsilon(0));
  CHECK_THAT(u.a_g, grams_near(2.9439203e-4, ug(0.001)));
  CHECK(u.b == Approx(8.8611041e-5).margin(1e-12).epsilon(0));
  REQUIRE(u.minimum_weight_g);
  CHECK_THAT(*u.minimum_weight_g, grams_near(0.71560508, ug(1)));
  // U(W) at 100 g, linear: 0.29439203 mg + 8.8611041e-5 x 100 g = 8.86110414 mg + 0.29439203 mg = 9.15549617 mg.
  CHECK_THAT(u.expanded_at(100), grams_near(9.15549617e-3, ug(0.01)));

  // Not corrected: b gains |a1| = 2e-6, b = 9.0611041e-5; W_min = 0.58878406 mg / (0.001 - 1.81222082e-4)
  // = 0.71910105 g.
  t.error_corrected = false;
  const auto v = ck::in_use_uncertainty(calibration(), t, Mass::grams(250));
  CHECK(v.b == Approx(9.0611041e-5).margin(1e-12).epsilon(0));
  REQUIRE(v.minimum_weight_g);
  CHECK_THAT(*v.minimum_weight_g, grams_near(0.71910105, ug(1)));
}

TEST_CASE("in-use minimum weight, quadratic-sum form, and when no load meets the requirement",
          "[unit][uncertainty][in-use]") {
  // Quadratic sum, corrected: SF k sqrt(alpha^2 + beta^2 W^2) = A W gives W^2 (A^2 - (SF k beta)^2) = (SF k alpha)^2,
  // W_min = 4 x 0.14719601 mg / sqrt(1e-6 - (4 x 4.4305521e-5)^2) = 0.58878406 mg / sqrt(1e-6 - 3.14076667e-8)
  // = 0.58878406 mg / sqrt(9.68592333e-7) = 0.58878406 mg / 9.8417088e-4 = 0.59825389 g (below the linear form's 0.7156
  // g: the linear form bounds it).
  auto t = terms();
  t.error_corrected = true;
  t.form = ck::InUseForm::quadratic_sum;
  const auto q = ck::in_use_uncertainty(calibration(), t, Mass::grams(250));
  REQUIRE(q.minimum_weight_g);
  CHECK_THAT(*q.minimum_weight_g, grams_near(0.59825389, ug(1)));
  // A required accuracy of 0.01 % with SF 2 against b = 8.86e-5: SF b = 1.77e-4 > 1e-4, no weight qualifies.
  t.form = ck::InUseForm::linear;
  t.required_relative = 1e-4;
  CHECK_FALSE(ck::in_use_uncertainty(calibration(), t, Mass::grams(250)).minimum_weight_g);
}

TEST_CASE("in-use terms refuse a negative term, a safety factor below 1 and an accuracy outside (0, 100 %)",
          "[unit][uncertainty][in-use]") {
  auto t = terms();
  t.drift_relative = -1e-6;
  CHECK_THROWS_AS(ck::in_use_uncertainty(calibration(), t, Mass::grams(250)), plumb::InputError);
  t = terms();
  t.safety_factor = 0.5;
  CHECK_THROWS_AS(ck::in_use_uncertainty(calibration(), t, Mass::grams(250)), plumb::InputError);
  t = terms();
  t.required_relative = 0;
  CHECK_THROWS_AS(ck::in_use_uncertainty(calibration(), t, Mass::grams(250)), plumb::InputError);
}
