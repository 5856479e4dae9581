#include <catch2/catch.hpp>

#include <cmath>

#include "checks/calibration.hpp"
#include "core/errors.hpp"
#include "support/margin.hpp"

using namespace plumb;
using namespace plumb::checks;
using plumb::test::grams_near;
using plumb::test::mass_near;
using plumb::test::mg;
using plumb::test::ug;

namespace {
ExactMass g(const char* s) {
  return ExactMass::parse(s, "mass", MassUnit::g);
}

CalibrationWeight weight(const char* id, const char* nominal) {
  CalibrationWeight w;
  w.id = id;
  w.nominal = g(nominal);
  w.expanded_uncertainty = g("0.05 mg");  // k = 2
  w.certificate = std::string("cert ") + id;
  return w;
}

CalibrationInput run() {
  CalibrationInput in;
  in.balance = {"B-1", g("220"), g("0.0001"), g("0.001"), r76::AccuracyClass::I};
  in.weights = {weight("W20", "20"), weight("W50", "50"), weight("W100", "100"), weight("W200", "200")};
  in.tolerance.kind = CalibrationTolerance::Kind::oiml_r76;
  in.rule = DecisionRule::guard_band_u;
  in.as_found.repeatability = {{g("100"),
                                {g("100.0000"), g("100.0001"), g("100.0000"), g("100.0001"), g("100.0000"),
                                 g("100.0001"), g("100.0000"), g("100.0001"), g("100.0000"), g("100.0001")}},
                               {g("20"), {g("20.0000"), g("20.0000"), g("20.0000"), g("20.0000"), g("20.0000")}}};
  EccentricityInput ecc;
  ecc.load = g("100");
  ecc.centre = g("100.0000");
  ecc.positions = {{"1", g("100.0002")}, {"2", g("99.9999")}, {"3", g("100.0001")}, {"4", g("100.0000")}};
  in.as_found.eccentricity = ecc;
  in.as_found.loads = {{"W20", {g("20.0000")}, {}},
                       {"W50", {g("50.0001")}, {}},
                       {"W100", {g("100.0003")}, {}},
                       {"W100+W50", {g("150.0002")}, {}},
                       {"W200", {g("200.0004")}, {}}};
  return in;
}
}  // namespace

TEST_CASE("calibration: the cg-18 budget of E at 100 g, worked by hand", "[unit][calibration]") {
  // Load W100, one reading 100.0003 g: E = +0.0003 g. Budget (hand), in g:
  //   rounding at zero and at load: d / (2 sqrt 3) = 0.0001 / 3.4641 = 2.88675e-5 each (squares 8.33333e-10)
  //   repeatability: series at 100 g, five 100.0000 and five 100.0001: deviations +/-0.00005,
  //     s^2 = 10 x 2.5e-9 / 9 = 2.777778e-9, s = 5.270463e-5, dof 9 (one reading at the load: s / sqrt 1)
  //   eccentricity: |dI|max = 0.0002 g at L_ecc = 100 g; at L = 100 g half-width 0.0002/200 x 100 = 0.0001,
  //     u = 0.0001 / sqrt 3 = 5.773503e-5 (square 3.333333e-9)
  //   reference weight: 0.05 mg / 2 = 2.5e-5 (square 6.25e-10); buoyancy 0 (8000 kg/m3); drift 0
  //   u_c^2 = 1.666667e-9 + 2.777778e-9 + 3.333333e-9 + 6.25e-10 = 8.402778e-9, u_c = 9.166667e-5
  //     (exactly 121/14400 mg^2: u_c = 11/120 mg)
  //   nu_eff = 9 x (8.402778 / 2.777778)^2 = 9 x 3.025^2 = 82.355625 -> 82; k between GUM G.2's 2.05 (nu = 50)
  //   and 2.025 (nu = 100)
  //   tolerance: class I, e = 0.001 g, 100 g = 100 000 e -> 1 e on initial verification, 2 e = 0.002 g in service
  // The budget's lines are plain numbers in g (stats works unit-free); each is held to 1e-6 ug (1e-12 g), with
  // the hand values to that many digits: 0.1 mg / (2 sqrt 3) = 0.028867513459 mg, s = 0.05 mg x sqrt(10/9)
  // = 0.052704627669 mg, 0.1 mg / sqrt 3 = 0.057735026919 mg.
  const auto r = evaluate_calibration(run());
  const auto& L = r.as_found.loads[2];
  CHECK(L.load.combination == "W100");
  CHECK(*L.load.error_exact == g("0.0003"));
  REQUIRE(L.budget.lines.size() == 7);
  CHECK_THAT(L.budget.lines[0].contribution, grams_near(2.8867513459e-5, ug(1e-6)));
  CHECK(L.budget.lines[1].input.source == "rounding at load");
  CHECK_THAT(L.budget.lines[2].contribution, grams_near(5.2704627669e-5, ug(1e-6)));
  CHECK(L.budget.lines[2].input.dof == 9.0);
  CHECK_THAT(L.budget.lines[3].contribution, grams_near(5.7735026919e-5, ug(1e-6)));
  CHECK_THAT(L.budget.lines[4].contribution, grams_near(2.5e-5, ug(1e-8)));
  CHECK(L.budget.lines[4].input.sensitivity == -1.0);
  CHECK(L.budget.lines[5].contribution == 0.0);
  CHECK_THAT(L.budget.combined, grams_near(9.1666666667e-5, ug(1e-6)));
  CHECK(L.budget.nu_eff == Approx(82.355625).margin(1e-6).epsilon(0));
  CHECK(L.budget.dof_used == 82.0);
  CHECK(L.budget.k > 2.025);
  CHECK(L.budget.k < 2.05);
  CHECK_THAT(L.budget.expanded, grams_near(L.budget.k * 9.1666666667e-5, ug(1e-6)));
  CHECK_THAT(L.tolerance, mass_near(mg(2), ug(0.001)));
  CHECK(L.decision.state == Conformity::pass);
  CHECK(L.weight_suitable);
  CHECK(L.repeatability_series == 1);
  // Loads of 20 g and 50 g take s from the 20 g series (nearest), which is 0 here.
  CHECK(r.as_found.loads[0].repeatability_series == 2);
  CHECK(r.as_found.loads[1].repeatability_series == 2);
  CHECK(r.as_found.overall == Conformity::pass);
  CHECK(r.rule_statement.find("guard band") != std::string::npos);
  CHECK_FALSE(r.as_left.has_value());
}

TEST_CASE("calibration: lab limits under a guard band give the not-proven states, and weight suitability",
          "[unit][calibration]") {
  auto in = run();
  in.tolerance.kind = CalibrationTolerance::Kind::lab;
  in.tolerance.lab_limit = g("0.0004");
  const auto r = evaluate_calibration(in);
  // 20 g: E = 0, U about 1e-4 -> a clear pass. 100 g: E = 0.0003 with U = 1.86e-4 -> 0.000486 > 0.0004.
  CHECK(r.as_found.loads[0].decision.state == Conformity::pass);
  CHECK(r.as_found.loads[2].decision.state == Conformity::pass_not_proven);
  CHECK(r.as_found.loads[4].decision.state == Conformity::pass_not_proven);
  CHECK(r.as_found.overall == Conformity::pass_not_proven);
  CHECK(r.as_found.weights_suitable);  // U 0.05 mg (0.1 mg for W100+W50) <= 0.4 mg / 3

  in.tolerance.lab_limit = g("0.0001");
  const auto tight = evaluate_calibration(in);
  CHECK(tight.as_found.loads[4].decision.state == Conformity::fail);  // 0.0004 - U(about 2.5e-4) > 0.0001
  CHECK(tight.as_found.overall == Conformity::fail);
  CHECK_FALSE(tight.as_found.weights_suitable);  // 0.05 mg > 0.1 mg / 3
  CHECK_FALSE(tight.as_found.loads[0].weight_suitable);

  in.rule = DecisionRule::simple_acceptance;
  in.tolerance.lab_limit = g("0.0004");
  CHECK(evaluate_calibration(in).as_found.overall == Conformity::pass);
}

TEST_CASE("calibration: USP <41> tolerance, environment and as-left", "[unit][calibration]") {
  auto in = run();
  in.tolerance.kind = CalibrationTolerance::Kind::usp41;
  in.environment = density::Environment{};
  in.environment->t_c = 21.0;
  in.environment->pressure_hpa = 990.0;
  in.environment->rh_pct = 45.0;
  CalibrationSet left;
  left.loads = {{"W20", {g("20.0000")}, {}},
                {"W50", {g("50.0000")}, {}},
                {"W100", {g("100.0000")}, {}},
                {"W100+W50", {g("150.0000")}, {}},
                {"W200", {g("200.0001")}, {}}};
  in.as_left = left;
  const auto r = evaluate_calibration(in);
  REQUIRE(r.air.has_value());
  CHECK(r.air->rho == Approx(density::air_cipm2007(21.0, 990.0, 45.0)).epsilon(1e-14));  // the same formula
  CHECK_THAT(r.as_found.loads[4].tolerance, mass_near(mg(200), ug(0.001)));              // 0.10 % of 200 g
  REQUIRE(r.as_left.has_value());
  CHECK(r.as_left->repeatability.size() == 2);  // inherited from as found
  CHECK(r.as_left->eccentricity.has_value());
  CHECK(r.as_left->overall == Conformity::pass);
  CHECK(*r.as_left->loads[2].load.error_exact == g("0.0000"));
  bool inherited_note = false;
  for (const auto& n : r.as_left->notes) inherited_note = inherited_note || n.find("as-found") != std::string::npos;
  CHECK(inherited_note);
}

TEST_CASE("calibration: bad input is refused, naming the field", "[unit][calibration]") {
  auto in = run();
  in.as_found.repeatability[0].readings.resize(4);
  CHECK_THROWS_WITH(evaluate_calibration(in), Catch::Contains("repeatability series 1"));
  in = run();
  in.as_found.repeatability.clear();
  CHECK_THROWS_WITH(evaluate_calibration(in), Catch::Contains("repeatability"));
  in = run();
  in.balance.accuracy_class.reset();
  CHECK_THROWS_WITH(evaluate_calibration(in), Catch::Contains("accuracy class"));
  in = run();
  in.environment = density::Environment{};
  in.environment->rh_pct = 120.0;
  CHECK_THROWS_WITH(evaluate_calibration(in), Catch::Contains("humidity"));
  in = run();
  in.environment = density::Environment{};
  in.environment->pressure_hpa = 1500.0;
  CHECK_THROWS_WITH(evaluate_calibration(in), Catch::Contains("pressure"));
  in = run();
  in.as_found.eccentricity->centre.reset();
  CHECK_THROWS_WITH(evaluate_calibration(in), Catch::Contains("centre"));
  in = run();
  in.as_found.loads[4].combination = "W200+W50";  // 250 g on a 220 g balance
  CHECK_THROWS_WITH(evaluate_calibration(in), Catch::Contains("capacity"));
  in = run();
  in.tolerance.kind = CalibrationTolerance::Kind::lab;
  CHECK_THROWS_WITH(evaluate_calibration(in), Catch::Contains("lab limits"));
}
