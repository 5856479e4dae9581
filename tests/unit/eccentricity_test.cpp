#include <catch2/catch.hpp>

#include <cmath>

#include "checks/eccentricity.hpp"
#include "core/errors.hpp"
#include "support/margin.hpp"

using namespace plumb;
using namespace plumb::checks;
using plumb::test::mass_near;
using plumb::test::mg;
using plumb::test::ug;

namespace {
ExactMass grams(const char* text) {
  return ExactMass::parse(text, "reading", MassUnit::g);
}

EccentricityInput run() {
  EccentricityInput in;
  in.load = ExactMass::parse("100 g", "load");
  in.centre = grams("100.0002");
  in.positions = {{"front-left", grams("100.0004")},
                  {"back-left", grams("99.9999")},
                  {"back-right", grams("100.0001")},
                  {"front-right", grams("100.0005")}};
  return in;
}
}  // namespace

TEST_CASE("eccentricity: exact deviations and the cg-18 contribution, by hand", "[unit][eccentricity]") {
  // Deviations from the centre 100.0002: +0.0002, -0.0003, -0.0001, +0.0003 -> |max| = 0.0003 g, first at
  // back-left. EURAMET cg-18: u(L) = |dI|max / (2 L_ecc) x L / sqrt 3; at L = 200 g:
  // 0.0003 / 200 x 200 / sqrt 3 = 1.7320508e-4 g; at L = 50 g a quarter of that, 4.330127e-5 g
  // (0.3 mg / sqrt 3 = 0.17320508076 mg; a quarter, 0.04330127019 mg). Masses to 1e-5 ug.
  const auto r = evaluate_eccentricity(run());
  REQUIRE(r.deviations.size() == 4);
  CHECK(r.deviations[0].deviation == grams("0.0002"));
  CHECK(r.deviations[1].deviation == grams("-0.0003"));
  CHECK(r.max_abs_deviation == grams("0.0003"));
  CHECK(r.max_position == "back-left");
  CHECK(r.relative_max == Approx(3e-6).epsilon(1e-12));  // 0.0003 g / 100 g, a ratio
  CHECK_THAT(r.uncertainty_at(Mass::grams(200.0)), mass_near(mg(0.17320508076), ug(1e-5)));
  CHECK_THAT(r.uncertainty_at(Mass::grams(50.0)), mass_near(mg(0.04330127019), ug(1e-5)));
  CHECK_THAT(r.half_width_at(Mass::grams(100.0)), mass_near(mg(0.15), ug(1e-5)));
}

TEST_CASE("eccentricity: bad runs are refused, naming the field", "[unit][eccentricity]") {
  auto in = run();
  in.centre.reset();
  CHECK_THROWS_WITH(evaluate_eccentricity(in), Catch::Contains("centre"));
  in = run();
  in.positions.pop_back();
  CHECK_THROWS_WITH(evaluate_eccentricity(in), Catch::Contains("at least 4"));
  in = run();
  in.positions[3].name = "Front-Left";
  CHECK_THROWS_WITH(evaluate_eccentricity(in), Catch::Contains("named twice"));
  in = run();
  in.positions[0].name = "centre";
  CHECK_THROWS_AS(evaluate_eccentricity(in), InputError);
  in = run();
  in.load = ExactMass::parse("0 g", "load");
  CHECK_THROWS_AS(evaluate_eccentricity(in), InputError);
  in = run();
  in.positions.push_back({"middle-back", grams("100.0002")});
  CHECK(evaluate_eccentricity(in).deviations.size() == 5);
}
