// The air buoyancy and weight drift terms of the EURAMET cg-18 (v4.0) budget from entered densities, density
// classes and drift allowances, and the air density's u from the thermometer, barometer and hygrometer
// (CIPM-2007): each worked by hand from the published formulas in the comments.
#include <catch2/catch.hpp>

#include <cmath>

#include "checks/calibration.hpp"
#include "metrology/air_density_cipm.hpp"
#include "support/margin.hpp"

using namespace plumb;
using namespace plumb::checks;
using Catch::Matchers::Contains;
using plumb::test::grams_near;
using plumb::test::mass_near;
using plumb::test::ug;

namespace {
ExactMass g(const char* s) {
  return ExactMass::parse(s, "mass", MassUnit::g);
}

CalibrationWeight weight(const char* id, const char* nominal, double rho, double u_rho, const char* source) {
  CalibrationWeight w;
  w.id = id;
  w.nominal = g(nominal);
  w.expanded_uncertainty = g("0.05 mg");
  w.density_kg_m3 = rho;
  w.u_density_kg_m3 = u_rho;
  w.density_source = source;
  return w;
}

LinearityInput loads() {
  LinearityInput in;
  in.capacity = g("220");
  in.readability = g("0.0001");
  // W100 and W20: density from OIML R 111-1:2004 Table 5, class E2 (from memory): >= 100 g 7810 to 8210 kg/m3,
  // u = 210 / sqrt 3; 20 g 7500 to 8570 kg/m3, u = 570 / sqrt 3. W50: entered 7950 +/- 5 kg/m3 (invented).
  in.weights = {weight("W100", "100", 8000.0, 210.0 / std::sqrt(3.0), "class E2 limits"),
                weight("W50", "50", 7950.0, 5.0, "entered"),
                weight("W20", "20", 8000.0, 570.0 / std::sqrt(3.0), "class E2 limits")};
  in.weights[0].drift = g("0.02 mg");
  in.weights[0].drift_source = "drift allowance entered";
  in.weights[1].drift_source = "no earlier certificate and no drift allowance entered";
  in.loads = {{"W20", {g("20.0000")}, {}},
              {"W50", {g("50.0000")}, {}},
              {"W100", {g("100.0001")}, {}},
              {"W100+W50", {g("150.0001")}, {}},
              {"W100+W50+W20", {g("170.0002")}, {}}};
  in.air = AirDensityUse{1.18, 0.0005, true};
  return in;
}
}  // namespace

TEST_CASE("cg-18 buoyancy and drift from entered densities, classes and a drift allowance, worked by hand",
          "[unit][calibration][buoyancy]") {
  // EURAMET cg-18 v4.0: delta_m_B = -m_c (rho_a - rho_0)(1/rho - 1/rho_c), rho_0 = 1.2, rho_c = 8000 kg/m3;
  // u^2 = m_c^2 [(1/rho - 1/rho_c)^2 u^2(rho_a) + (rho_a - rho_0)^2 u^2(rho) / rho^4 + u^2(rho_a) u^2(rho) / rho^4]
  // (the last term GUM 5.1.2 note, second order); rho_a = 1.18 +/- 0.0005 kg/m3. By hand, in g:
  //   W100 (rho 8000): correction 0; u = sqrt((100 x 0.02 x 121.2435565 / 64e6)^2 + (100 x 0.0005 x 121.2435565
  //     / 64e6)^2) = sqrt(3.7888611e-6^2 + 9.4721529e-8^2) = 3.7900450e-6
  //   W50 (rho 7950 +/- 5): 1/7950 - 1/8000 = 50 / 63.6e6 = 7.8616352e-7; correction -50 x (-0.02) x 7.8616352e-7
  //     = 7.8616352e-7; u = sqrt((50 x 7.8616352e-7 x 0.0005)^2 + (50 x 0.02 x 5 / 7950^2)^2
  //     + (50 x 0.0005 x 5 / 7950^2)^2) = sqrt(1.9654088e-8^2 + 7.9110795e-8^2 + 1.9777699e-9^2) = 8.1539638e-8
  //   W20 (rho 8000): u = sqrt((20 x 0.02 x 329.0896534 / 64e6)^2 + (20 x 0.0005 x 329.0896534 / 64e6)^2)
  //     = 2.0574530e-6
  // With the correction applied the weights' u add linearly (one air density): W100+W50 u = 3.8715846e-6 g.
  // Drift (cg-18, rectangular): W100 D = 0.02 mg, u = 0.02 / sqrt 3 mg = 1.1547005e-5 g; W50 none.
  const auto r = evaluate_linearity(loads());
  const auto& w20 = r.loads[0];
  const auto& w100_50 = r.loads[3];
  const auto& all = r.loads[4];
  CHECK_THAT(w20.u_buoyancy, mass_near(Mass::grams(2.0574529868e-6), ug(1e-7)));
  CHECK(w20.buoyancy_correction.g() == 0.0);
  CHECK_THAT(w100_50.u_buoyancy, mass_near(Mass::grams(3.8715846138e-6), ug(1e-7)));
  CHECK_THAT(w100_50.buoyancy_correction, mass_near(Mass::grams(7.8616352201e-7), ug(1e-7)));
  CHECK_THAT(all.u_buoyancy, mass_near(Mass::grams(3.8715846138e-6 + 2.0574529868e-6), ug(1e-7)));
  CHECK_THAT(w100_50.u_drift, mass_near(Mass::grams(1.1547005384e-5), ug(1e-7)));
  CHECK(w20.u_drift.g() == 0.0);
}

TEST_CASE("cg-18 budget rows say where the buoyancy and drift values came from", "[unit][calibration][buoyancy]") {
  const auto lin = loads();
  CalibrationInput in;
  in.balance = {"B-1", g("220"), g("0.0001"), g("0.001"), r76::AccuracyClass::I};
  in.weights = lin.weights;
  in.environment = density::Environment{20.0, 1013.25, 50.0};
  in.tolerance.kind = CalibrationTolerance::Kind::lab;
  in.tolerance.lab_limit = g("0.001");
  in.as_found.repeatability = {{g("100"), {g("100.0000"), g("100.0001"), g("100.0000"), g("100.0001"), g("100.0000")}}};
  in.as_found.loads = lin.loads;
  const auto r = evaluate_calibration(in);
  const auto& L = r.as_found.loads[3];  // W100+W50
  const stats::BudgetLine* buoyancy = nullptr;
  const stats::BudgetLine* drift = nullptr;
  for (const auto& line : L.budget.lines) {
    if (line.input.source == "air buoyancy") buoyancy = &line;
    if (line.input.source == "weight drift") drift = &line;
  }
  REQUIRE(buoyancy);
  REQUIRE(drift);
  CHECK(buoyancy->contribution > 0.0);  // not zero: the densities are uncertain
  CHECK_THAT(buoyancy->input.note, Contains("EURAMET cg-18 v4.0") &&
                                       Contains("W100: rho 8000 kg/m3, u 121 kg/m3 "
                                                "(class E2 limits)") &&
                                       Contains("W50: rho 7950 kg/m3, u 5 kg/m3 (entered)") && Contains("measured"));
  // The drift row: u = D / sqrt 3 of W100's allowance, 0.02 mg / sqrt 3 (hand: 1.1547005e-5 g).
  CHECK_THAT(drift->contribution, grams_near(1.1547005384e-5, ug(1e-7)));
  CHECK_THAT(drift->input.note, Contains("W100: D = 0.02 mg (drift allowance entered)") &&
                                    Contains("W50: no D (no earlier certificate and no drift allowance entered)"));
}

TEST_CASE("air density u from the thermometer, barometer and hygrometer (CIPM-2007), worked by hand",
          "[unit][density]") {
  // CIPM-2007 (Picard et al., Metrologia 45 (2008) 149): rho = p M_a / (Z R T) (1 - x_v g), g = 1 - M_v / M_a,
  // x_v = h f p_sv / p, Z = 1 - (p/T) S + (p/T)^2 Q with S = a0 + a1 t + a2 t^2 + (b0 + b1 t) x_v + (c0 + c1 t) x_v^2,
  // Q = d + e x_v^2 (the paper's constants, from memory). At t = 20 degC, p = 101325 Pa, h = 50 %, by hand with a
  // calculator: p_sv = 2339.163 Pa, f = 1.0040256, x_v = 0.01158934, S = 1.1205114e-6, Z = 0.9996148,
  // rho = 1.1993139 kg/m3, K = M_a / (Z R T) = 1.1888394e-5 kg/m3 per Pa. The partial derivatives of that formula:
  //   dZ/dx_v = -(p/T)(b0 + b1 t + 2 (c0 + c1 t) x_v) + (p/T)^2 2 e x_v = -3.0654074e-3
  //   t: dp_sv/dt = p_sv (2 A T + B - D / T^2) = 144.907 Pa/K, dx_v/dt = (h/p)(f dp_sv/dt + p_sv 2 gamma t)
  //      = 7.181981e-4 per K, dZ/dt = (p/T^2) S - (p/T) dS/dt - 2 p^2 Q / T^3 + dZ/dx_v dx_v/dt = 7.909227e-6 per K,
  //      drho/dt = rho (-1/T - dZ/dt / Z) - K p g dx_v/dt = -4.4276744e-3 kg/m3 per K
  //   p: dx_v/dp = -x_v / p + h p_sv beta / p = -1.1401545e-7 per Pa, dZ/dp = -S/T + 2 p Q / T^2 + dZ/dx_v dx_v/dp
  //      = -3.43208e-9 per Pa, drho/dp = rho (1/p - dZ/dp / Z) - K p g dx_v/dp = 1.1892347e-3 kg/m3 per hPa
  //   h: dx_v/dh = f p_sv / (100 p) = 2.3178e-4 per %RH, drho/dh = -(rho / Z) dZ/dx_v dx_v/dh - K p g dx_v/dh
  //      = -1.0470023e-4 kg/m3 per %RH
  // With u(t) = 0.1 degC, u(p) = 0.5 hPa, u(h) = 5 %RH: 4.4276744e-4, 5.9461734e-4, 5.2350116e-4 kg/m3;
  // u_conditions = 9.0756060e-4 kg/m3; the equation's own 22e-6 x rho = 2.6384906e-5 (Picard et al. 2008);
  // u = 9.0794406e-4 kg/m3. The code takes central differences of the formula: equal to these within 1e-8.
  density::Environment env{20.0, 1013.25, 50.0};
  env.u_t_c = 0.1;
  env.u_pressure_hpa = 0.5;
  env.u_rh_pct = 5.0;
  const auto a = density::air_density(env);
  CHECK(a.rho == Approx(1.1993139).margin(2e-6).epsilon(0));
  CHECK(a.dp == Approx(1.1892347e-3).margin(2e-9).epsilon(0));
  CHECK(a.dt == Approx(-4.4276744e-3).margin(2e-8).epsilon(0));
  CHECK(a.dh == Approx(-1.0470023e-4).margin(2e-10).epsilon(0));
  CHECK(a.u_formula == Approx(2.6384906e-5).margin(1e-10).epsilon(0));
  CHECK(a.u_conditions == Approx(9.0756060e-4).margin(5e-9).epsilon(0));
  CHECK(a.u == Approx(9.0794406e-4).margin(5e-9).epsilon(0));
  // Not entered: the equation's u alone.
  const auto bare = density::air_density(density::Environment{20.0, 1013.25, 50.0});
  CHECK(bare.u == Approx(2.6384906e-5).margin(1e-10).epsilon(0));
}
