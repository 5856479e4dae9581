#include <catch2/catch.hpp>

#include <cmath>

#include "checks/linearity.hpp"
#include "core/errors.hpp"
#include "support/margin.hpp"

using namespace plumb;
using namespace plumb::checks;
using plumb::test::grams_near;
using plumb::test::mass_near;
using plumb::test::mg;
using plumb::test::ug;

// Masses in these cases are held to 1e-6 ug (1e-12 g) where they are exact to rounding, and to the margin
// named beside a check where a fit of readings near 250 g leaves more rounding; d is 0.1 mg throughout.

namespace {
ExactMass g(const char* s) {
  return ExactMass::parse(s, "mass", MassUnit::g);
}

CalibrationWeight weight(const char* id, const char* nominal, const char* U = "0.05 mg") {
  CalibrationWeight w;
  w.id = id;
  w.nominal = g(nominal);
  w.expanded_uncertainty = ExactMass::parse(U, "U");
  w.certificate = "cert-" + std::string(id);
  return w;
}

// A balance with a pure sensitivity error of +2e-6: I = 1.000002 m, readable to 0.1 mg.
LinearityInput sensitivity_run() {
  LinearityInput in;
  in.capacity = g("300");
  in.readability = g("0.0001");
  in.weights = {weight("W50", "50"), weight("W100", "100"), weight("W200", "200")};
  in.loads = {{"W50", {g("50.0001")}, {}},
              {"W100", {g("100.0002")}, {g("100.0003")}},
              {"W100+W50", {g("150.0003")}, {}},
              {"W200", {g("200.0004")}, {}},
              {"W200 + W50", {g("250.0005")}, {}}};
  in.model = stats::Model::through_origin;
  return in;
}
}  // namespace

TEST_CASE("combinations of weights", "[unit][linearity]") {
  CHECK(parse_combination("W100+W50+W20") == std::vector<std::string>{"W100", "W50", "W20"});
  CHECK(parse_combination(" W1 ") == std::vector<std::string>{"W1"});
  CHECK_THROWS_WITH(parse_combination("W100++W50", "load 3"), Catch::Contains("load 3"));
  CHECK_THROWS_AS(parse_combination(""), InputError);
}

TEST_CASE("error of indication: exact E, hysteresis, through-origin fit of a pure sensitivity error",
          "[unit][linearity]") {
  const auto r = evaluate_linearity(sensitivity_run());
  REQUIRE(r.loads.size() == 5);
  // E = I - m_c exactly (one reading, no air measured so no correction): 0.0001 g per 50 g.
  CHECK(*r.loads[0].error_exact == g("0.0001"));
  CHECK(*r.loads[4].error_exact == g("0.0005"));
  CHECK(r.loads[2].nominal == g("150"));
  CHECK(r.loads[4].weight_ids == std::vector<std::string>{"W200", "W50"});
  CHECK_THAT(*r.loads[1].hysteresis, mass_near(mg(0.1), ug(1e-6)));
  CHECK_THAT(*r.max_abs_hysteresis, mass_near(mg(0.1), ug(1e-6)));
  CHECK(r.max_error_load == 5);
  // Certificate U = 0.05 mg, k = 2 -> u = 0.025 mg per weight, summed: 0.05 mg for W100+W50.
  CHECK_THAT(r.loads[2].u_weights, mass_near(mg(0.05), ug(1e-6)));
  // Air not measured: buoyancy uncertainty from 1.2 +/- 0.12 kg/m3 is zero for 8000 kg/m3 weights.
  CHECK(r.loads[0].u_buoyancy.g() == 0.0);
  CHECK_FALSE(r.notes.empty());
  // The fit: slope 1.000002 exactly, residuals zero to rounding.
  REQUIRE(r.fit.coef.size() == 1);
  CHECK(r.fit.coef[0] == Approx(1.000002).epsilon(1e-13));
  CHECK(r.fit.residual_sd < 1e-10);
  CHECK(r.fit.r_squared > 0.999999);
  CHECK(r.error_equation.find("E = 2e-06 m") != std::string::npos);
  // Interpolated error at 125 g: 125 x 2e-6 = 0.00025 g.
  const auto at = error_at(r, Mass::grams(125.0));
  CHECK_THAT(at.error, mass_near(mg(0.25), ug(1e-5)));
  CHECK_FALSE(at.extrapolated);
  // 300 g lies beyond the largest calibrated load (250 g): refused, or marked on request.
  CHECK_THROWS_WITH(error_at(r, Mass::grams(300.0)), Catch::Contains("extrapolation"));
  const auto ex = error_at(r, Mass::grams(300.0), Extrapolation::mark);
  CHECK(ex.extrapolated);
  CHECK_THAT(ex.error, mass_near(mg(0.6), ug(1e-5)));
}

TEST_CASE("straight line and quadratic fits through the linearity layer", "[unit][linearity]") {
  auto in = sensitivity_run();
  in.model = stats::Model::line;
  const auto line = evaluate_linearity(in);
  REQUIRE(line.fit.coef.size() == 2);
  CHECK_THAT(line.fit.coef[0], grams_near(0.0, ug(1e-4)));  // intercept, g
  CHECK(line.fit.coef[1] == Approx(1.000002).epsilon(1e-13));

  // A quadratic balance, I = m + 1e-8 m^2 (hand: 100 -> 100.0001, 200 -> 200.0004, 300 -> 300.0009,
  // 400 -> 400.0016, 500 -> 500.0025).
  LinearityInput q;
  q.capacity = g("500");
  q.readability = g("0.0001");
  q.weights = {weight("A100", "100"), weight("A200", "200"), weight("B200", "200")};
  q.loads = {{"A100", {g("100.0001")}, {}},
             {"A200", {g("200.0004")}, {}},
             {"A200+A100", {g("300.0009")}, {}},
             {"A200+B200", {g("400.0016")}, {}},
             {"A200+B200+A100", {g("500.0025")}, {}}};
  q.model = stats::Model::quadratic;
  const auto r = evaluate_linearity(q);
  REQUIRE(r.fit.coef.size() == 3);
  CHECK_THAT(r.fit.coef[0], grams_near(0.0, ug(0.01)));                                // intercept, g
  CHECK(r.fit.coef[1] == Approx(1.0).margin(1e-10).epsilon(0));                        // g/g
  CHECK(r.fit.coef[2] == Approx(1e-8).margin(1e-13).epsilon(0));                       // 1/g
  CHECK_THAT(error_at(r, Mass::grams(250.0)).error, mass_near(mg(0.625), ug(0.001)));  // 1e-8 x 250^2 g
}

TEST_CASE("conventional mass from the certificate, and the buoyancy correction", "[unit][linearity]") {
  auto in = sensitivity_run();
  in.weights[1].conventional_mass = g("100.00003");  // certificate: +0.03 mg
  const auto r = evaluate_linearity(in);
  CHECK(*r.loads[1].error_exact == g("0.00017"));  // 100.0002 - 100.00003, by hand

  // Air 1.3 kg/m3 measured; W100 of 7950 kg/m3 (hand): -100 x 0.1 x (1/7950 - 1/8000)
  // = -10 x 50 / 63,600,000 = -7.861635e-6 g (-7.8616352201e-6).
  auto b = sensitivity_run();
  b.weights[1].density_kg_m3 = 7950.0;
  b.air = AirDensityUse{1.3, 0.0, true};
  const auto rb = evaluate_linearity(b);
  CHECK_THAT(rb.loads[1].buoyancy_correction, mass_near(Mass::grams(-7.8616352201e-6), ug(1e-6)));
  CHECK_THAT(rb.loads[1].reference, mass_near(Mass::grams(100.0 - 7.8616352201e-6), ug(1e-5)));
  CHECK_FALSE(rb.loads[1].error_exact.has_value());
  CHECK_THAT(rb.loads[1].error, mass_near(Mass::grams(0.0002 + 7.8616352201e-6), ug(1e-4)));
  CHECK(rb.loads[0].buoyancy_correction.g() == 0.0);  // W50 is 8000 kg/m3

  // A weight known only by its class: u = MPE / sqrt 3 (R 111 F1 100 g: 0.5 mg -> 0.288675 mg).
  auto c = sensitivity_run();
  c.weights[1].expanded_uncertainty.reset();
  c.weights[1].weight_class = weights::WeightClass::F1;
  const auto rc = evaluate_linearity(c);
  CHECK(rc.loads[1].class_only);
  CHECK_THAT(rc.loads[1].u_weights, mass_near(mg(0.5 / std::sqrt(3.0)), ug(1e-6)));

  // Drift D = 0.03 mg of W100 and 0.02 mg of W50: u = (0.03 + 0.02) mg / sqrt 3 = 2.886751e-5 g at W100+W50
  // (0.028867513459 mg).
  auto dr = sensitivity_run();
  dr.weights[1].drift = g("0.03 mg");
  dr.weights[0].drift = g("0.02 mg");
  CHECK_THAT(evaluate_linearity(dr).loads[2].u_drift, mass_near(mg(0.028867513459), ug(1e-6)));
}

TEST_CASE("error of indication: bad input is refused, naming the field", "[unit][linearity]") {
  auto in = sensitivity_run();
  in.capacity = g("220");
  CHECK_THROWS_WITH(evaluate_linearity(in), Catch::Contains("above the capacity"));
  in = sensitivity_run();
  in.loads[2].combination = "W50+W50";
  CHECK_THROWS_WITH(evaluate_linearity(in), Catch::Contains("named twice"));
  in = sensitivity_run();
  in.loads[2].combination = "W100+W7";
  CHECK_THROWS_WITH(evaluate_linearity(in), Catch::Contains("W7"));
  in = sensitivity_run();
  in.loads.pop_back();
  CHECK_THROWS_WITH(evaluate_linearity(in), Catch::Contains("at least 5"));
  in = sensitivity_run();
  in.loads[0].up = {g("50.00012")};
  CHECK_THROWS_WITH(evaluate_linearity(in), Catch::Contains("readability"));
  in = sensitivity_run();
  in.loads[0].up.clear();
  CHECK_THROWS_WITH(evaluate_linearity(in), Catch::Contains("load 1"));
  in = sensitivity_run();
  in.weights[0].expanded_uncertainty.reset();
  CHECK_THROWS_WITH(evaluate_linearity(in), Catch::Contains("W50"));
  // A quadratic needs 3 distinct loads: five loads of only two masses.
  in = sensitivity_run();
  in.model = stats::Model::quadratic;
  in.loads = {{"W50", {g("50.0001")}, {}},
              {"W100", {g("100.0002")}, {}},
              {"W50", {g("50.0001")}, {}},
              {"W100", {g("100.0002")}, {}},
              {"W50", {g("50.0002")}, {}}};
  CHECK_THROWS_WITH(evaluate_linearity(in), Catch::Contains("3 distinct"));
}
