// The gravimetric pipette check (ISO 8655-6 method, ISO 8655-2 limits): a complete worked example computed
// by hand from the published formulas, then the rules (test volumes, channels, doubling, evaporation,
// completeness) and every kind of bad input.
#include <catch2/catch.hpp>

#include <string>
#include <vector>

#include "checks/pipette.hpp"
#include "core/errors.hpp"
#include "support/margin.hpp"

using Catch::Matchers::Contains;
using plumb::Decimal;
using plumb::InputError;
using plumb::MassReading;
using plumb::MassUnit;
using plumb::Verdict;
using plumb::Volume;
using plumb::test::mass_near;
using plumb::test::mg;
using plumb::test::percent_near;
using plumb::test::pp;
using plumb::test::ug;
using plumb::test::ul;
using plumb::test::volume_near;
namespace ck = plumb::checks;
namespace pl = plumb::pipette_limits;

namespace {

Decimal dec(const char* s) {
  return Decimal::parse(s);
}
plumb::ExactVolume exact_ul(const char* s) {
  return plumb::ExactVolume::microlitres(Decimal::parse(s));
}

std::vector<MassReading> grams(const std::vector<std::string>& texts) {
  std::vector<MassReading> out;
  for (const auto& t : texts) out.push_back({t, MassUnit::g, Decimal::parse(t)});
  return out;
}

// The ten weighings of the worked example, as a 0.01 mg balance displays them in g.
const std::vector<std::string> ten = {"0.09971", "0.09965", "0.09980", "0.09958", "0.09992",
                                      "0.09975", "0.09969", "0.09983", "0.09961", "0.09977"};

/// Weighings shifted by `delta_mg` hundredths of a mg (exact text, for a second channel).
std::vector<std::string> shifted(const std::vector<std::string>& texts, int delta_hundredths_mg) {
  std::vector<std::string> out;
  for (const auto& t : texts) {
    const Decimal d = Decimal::parse(t) + Decimal(delta_hundredths_mg, 5);
    out.push_back(d.to_string());
  }
  return out;
}

ck::PipetteRunInput fixed_100ul_run() {
  ck::PipetteRunInput in;
  in.pipette.id = "P-100";
  in.pipette.kind = ck::PipetteKind::fixed;
  in.pipette.nominal = exact_ul("100");
  in.pipette.channels = 1;
  in.balance.id = "B-7";
  in.balance.readability = plumb::ExactMass::parse("0.01 mg", "readability");
  in.balance.repeatability = plumb::Mass::grams(0.000012);  // 0.012 mg
  in.environment = {20.0, 1013.0, 50.0};
  in.volumes = {{exact_ul("100"), {{1, grams(ten)}}}};
  return in;
}

}  // namespace

TEST_CASE("Worked example by hand: fixed 100 uL pipette, ten weighings at 20 degC", "[reference][pipette]") {
  // Computed by hand (a pocket calculator, no program) from the published formulas quoted in
  // shared/reference-data/README.md: Tanaka et al. 2001, OIML R 111-1 Annex E, ISO 8655-6 Z and errors,
  // ISO 8655-2:2002 Table 1 limits (transcribed from memory).
  //
  // Conditions: water and air 20 degC, p = 1013 hPa, h = 50 %RH. Balance d = 0.01 mg.
  //
  // 1. Water density (Tanaka): t + a1 = 20 - 3.983035 = 16.016965; (t + a1)^2 = 256.5431678;
  //    t + a2 = 321.797; (t + a1)^2 (t + a2) = 82554.82177; a3 (t + a4) = 522528.9 * 89.34881 = 46687335.41;
  //    ratio = 82554.82177 / 46687335.41 = 0.0017682487;
  //    rho_w = 999.974950 * (1 - 0.0017682487) = 998.20675 kg/m3.
  // 2. Air density (OIML R 111 E.3-1): 0.34848 * 1013 = 353.01024; exp(0.061 * 20) = exp(1.22) = 3.3871877;
  //    0.009 * 50 * 3.3871877 = 1.5242345; (353.01024 - 1.5242345) / (273.15 + 20) = 351.4860055 / 293.15
  //    = 1.1989971 kg/m3.
  // 3. Z = 1000 / (rho_w - rho_a) * (1 - rho_a / 8000)
  //      = 1000 / (998.20675 - 1.1989971) * (1 - 1.1989971 / 8000)
  //      = 1000 / 997.00775 * (1 - 0.00014987464)
  //      = 1.0030012 * 0.9998501 = 1.0028509 uL/mg.
  // 4. Weighings (mg): 99.71 99.65 99.80 99.58 99.92 99.75 99.69 99.83 99.61 99.77.
  //    Sum = 997.31; mean m = 99.731 mg.
  //    Deviations from the mean: -0.021 -0.081 +0.069 -0.151 +0.189 +0.019 -0.041 +0.099 -0.121 +0.039
  //    (they sum to 0). Squares: 0.000441 0.006561 0.004761 0.022801 0.035721 0.000361 0.001681 0.009801
  //    0.014641 0.001521; sum = 0.098290 mg^2; variance = 0.098290 / 9 = 0.010921111 mg^2;
  //    s(m) = sqrt(0.010921111) = 0.1045041 mg.
  // 5. Volumes: V_i = m_i * Z, e.g. V_1 = 99.71 * 1.0028509 = 99.99426 uL; V_5 = 99.92 * 1.0028509 = 100.20486 uL.
  //    Mean volume = 99.731 * 1.0028509 = 100.01532 uL.
  // 6. Systematic error e_s = 100.01532 - 100 = +0.01532 uL = +0.01532 % of 100 uL.
  //    Random error s_r = 0.1045041 * 1.0028509 = 0.1048020 uL; CV = 100 * 0.1048020 / 100.01532 = 0.10479 %.
  // 7. Limits, ISO 8655-2:2002 Table 1 at 100 uL, single channel: |e_s| <= 0.8 uL, s_r <= 0.3 uL.
  //    |+0.01532| <= 0.8 and 0.1048 <= 0.3: PASS.
  //    Balance (ISO 8655-6 Table 1, 10 uL < V <= 100 uL): d <= 0.01 mg (0.01), s <= 0.02 mg (0.012): suitable.
  const ck::PipetteRunResult r = ck::evaluate_pipette_run(fixed_100ul_run());
  // Every margin below is half a unit in the last digit worked by hand (the mean mass, exact, to 1e-6 ug); the
  // limits are exact table values (1e-9 uL).

  CHECK(r.z.water_density_kg_m3 == Approx(998.20675).margin(0.000005).epsilon(0));
  CHECK(r.z.air_density_kg_m3 == Approx(1.1989971).margin(0.0000005).epsilon(0));
  CHECK(r.z.z_ul_per_mg == Approx(1.0028509).margin(0.00000005).epsilon(0));

  REQUIRE(r.volumes.size() == 1);
  REQUIRE(r.volumes[0].channels.size() == 1);
  const ck::ChannelResult& c = r.volumes[0].channels[0];
  CHECK(c.n == 10);
  CHECK_THAT(c.mean_mass, mass_near(mg(99.731), ug(1e-6)));
  CHECK_THAT(c.sd_mass, mass_near(mg(0.1045041), ug(5e-5)));
  REQUIRE(c.volumes.size() == 10);
  CHECK_THAT(c.volumes[0], volume_near(Volume::microlitres(99.99426), ul(0.000005)));
  CHECK_THAT(c.volumes[4], volume_near(Volume::microlitres(100.20486), ul(0.000005)));
  CHECK_THAT(c.mean, volume_near(Volume::microlitres(100.01532), ul(0.000005)));
  CHECK_THAT(c.systematic_error, volume_near(Volume::microlitres(0.01532), ul(0.000005)));
  CHECK_THAT(c.systematic_error_pct, percent_near(0.01532, pp(0.000005)));
  CHECK_THAT(c.random_error, volume_near(Volume::microlitres(0.1048020), ul(0.0000005)));
  CHECK_THAT(c.cv_pct, percent_near(0.10479, pp(0.000005)));
  CHECK_THAT(c.limits.systematic, volume_near(Volume::microlitres(0.8), ul(1e-9)));
  CHECK_THAT(c.limits.random, volume_near(Volume::microlitres(0.3), ul(1e-9)));
  CHECK(c.verdict == Verdict::pass);
  CHECK(c.reasons.empty());
  CHECK(r.volumes[0].balance.suitable);
  CHECK(r.complete);
  CHECK(r.verdict == Verdict::pass);
  CHECK(r.reasons.empty());
}

TEST_CASE("Worked example by hand: the ISO 8655-6 uncertainty budget of the mean volume", "[pipette][uncertainty]") {
  // The worked example above (m = 99.731 mg, n = 10, s(m) = sqrt(0.098290 / 9) = 0.10450412007 mg, so
  // s_r = 0.10450412007 x 1.0028509 = 0.10480205086 uL, Z = 1.0028509 uL/mg, rho_w = 998.20675,
  // rho_a = 1.1989971 kg/m3 at 20 degC, 1013 hPa, 50 %RH; d = 0.01 mg), with a balance whose calibration gives
  // u = 0.01 mg for a weighing. Model: GUM (JCGM 100:2008) 5.1.2 applied to V = Z m (ISO 8655-6 method):
  //   dZ/drho_w = -Z / (rho_w - rho_a) = -1.0028509 / 997.00775 = -0.00100586068 uL/mg per kg/m3;
  //   dZ/drho_a = Z / (rho_w - rho_a) - 1000 / (8000 (rho_w - rho_a)) = 0.00100586068 - 0.00012537515
  //             = 0.00088048553 uL/mg per kg/m3;
  //   d rho_w/dt from Tanaka's formula, x = t + a1 = 16.016965, y = t + a2 = 321.797, w = t + a4 = 89.34881:
  //     df/dt = (2 x y + x^2) / (a3 w) - x^2 y / (a3 w^2) = 0.00020650149; d rho_w/dt = -a5 df/dt
  //     = -0.2064963 kg/m3 per degC;
  //   d rho_a/dt (OIML R 111-1 E.3) = (-0.009 h 0.061 e^{0.061 t} (273.15 + t) - (0.34848 p - 0.009 h e^{0.061 t}))
  //     / (273.15 + t)^2 = -0.0044072 kg/m3 per degC;
  //   dZ/dt = 0.00100586068 x 0.2064963 + 0.00088048553 x (-0.0044072) = 0.00020382604 uL/mg per degC.
  // Contributions to u(V) in uL:
  //   repeatability of the mean  0.10480205086 / sqrt(10)            = 0.0331413184
  //   balance calibration        0.01 x 1.0028509                     = 0.0100285090
  //   balance readability        0.01 / (2 sqrt 3) x 1.0028509        = 0.0028949812
  //   water temperature          (0.2 / sqrt 3) x 99.731 x 0.00020382604 = 0.0023472493 (default thermometer)
  //   air density                0.01 x 99.731 x 0.00088048553        = 0.0008781170 (default u(rho_a))
  //   water density formula      0.00042 x 99.731 x 0.00100586068     = 0.0000421325
  //   u_c = 0.0348364944 uL, U(e_s) = 2 u_c = 0.0696729887 uL = 0.0696729887 % of 100 uL.
  //   U(s_r) = 2 x 0.10480205086 / sqrt(18) = 0.0494041606 uL; U(CV) = 100 x 0.0494041606 / 100.01532
  //   = 0.0493965930 pp.
  // (Worked with a calculator from the formulas; the code's own Z differs from the rounded hand Z by < 1e-7.)
  auto in = fixed_100ul_run();
  in.balance.standard_uncertainty = plumb::Mass::milligrams(0.01);
  const ck::PipetteRunResult r = ck::evaluate_pipette_run(in);
  const ck::PipetteUncertainty& u = r.volumes.at(0).channels.at(0).uncertainty;
  REQUIRE(u.budget.lines.size() == 6);
  CHECK(u.k == 2.0);
  CHECK(u.budget.lines[0].contribution == Approx(0.0331413184).margin(5e-10).epsilon(0));
  CHECK(u.budget.lines[1].contribution == Approx(0.0100285090).margin(5e-10).epsilon(0));
  CHECK(u.budget.lines[2].contribution == Approx(0.0028949812).margin(5e-10).epsilon(0));
  CHECK(u.budget.lines[3].contribution == Approx(0.0023472493).margin(5e-9).epsilon(0));
  CHECK(u.budget.lines[4].contribution == Approx(0.0008781170).margin(5e-10).epsilon(0));
  CHECK(u.budget.lines[5].contribution == Approx(0.0000421325).margin(5e-11).epsilon(0));
  CHECK_THAT(u.systematic_expanded, volume_near(Volume::microlitres(0.0696729887), ul(5e-9)));
  CHECK_THAT(u.systematic_expanded_pct, percent_near(0.0696729887, pp(5e-9)));
  CHECK_THAT(u.random_expanded, volume_near(Volume::microlitres(0.0494041606), ul(5e-9)));
  CHECK_THAT(u.cv_expanded_pct, percent_near(0.0493965930, pp(5e-9)));
}

TEST_CASE("pipette budget: an entered thermometer u and an evaporation correction enter, a bad u is refused",
          "[pipette][uncertainty]") {
  // Same run without a balance calibration u, with u(t) = 0.05 degC entered and evaporation e = 0.02 mg:
  //   water temperature 0.05 x 99.751 x 0.00020382604 (m = 99.731 + 0.02 = 99.751 mg) = 0.0010165926 uL
  //   (dZ/dt does not depend on the mass); evaporation 0.02 / sqrt 3 x 1.0028509
  //   = 0.0115799247 uL.
  auto in = fixed_100ul_run();
  in.evaporation_per_weighing = plumb::ExactMass::parse("0.02mg", "evaporation");
  in.uncertainty.water_temperature_u_c = 0.05;
  const ck::PipetteRunResult r = ck::evaluate_pipette_run(in);
  const auto& lines = r.volumes.at(0).channels.at(0).uncertainty.budget.lines;
  REQUIRE(lines.size() == 6);  // no balance calibration line; an evaporation line
  CHECK_THAT(lines[2].input.source, Contains("water temperature"));
  CHECK(lines[2].contribution == Approx(0.0010165926).margin(5e-9).epsilon(0));
  CHECK_THAT(lines[4].input.source, Contains("evaporation"));
  CHECK(lines[4].contribution == Approx(0.0115799247).margin(5e-10).epsilon(0));
  in.uncertainty.water_temperature_u_c = -0.1;
  CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("water temperature uncertainty -0.1 degC"));
}

TEST_CASE("Worked example against tighter lab limits fails, naming the reason", "[pipette]") {
  // Same data as the worked example: e_s = +0.01532 uL (+0.01532 %), s_r = 0.1048 uL, CV = 0.1048 %.
  auto in = fixed_100ul_run();
  SECTION("lab uL: random 0.1 uL < 0.1048 uL fails; systematic 0.5 uL passes") {
    in.pipette.limits = {pl::LimitsPolicy::Kind::lab_ul, dec("0.5"), dec("0.1")};
    const auto r = ck::evaluate_pipette_run(in);
    CHECK(r.verdict == Verdict::fail);
    REQUIRE(r.reasons.size() == 1);
    CHECK_THAT(r.reasons[0], Contains("100 uL, channel 1") && Contains("random error s = 0.105 uL") &&
                                 Contains("0.100 uL") && Contains("lab limits (uL)"));
  }
  SECTION("lab %: systematic 0.01 % < 0.0153 % fails; CV limit 0.2 % passes") {
    in.pipette.limits = {pl::LimitsPolicy::Kind::lab_pct, dec("0.01"), dec("0.2")};
    const auto r = ck::evaluate_pipette_run(in);
    CHECK(r.verdict == Verdict::fail);
    REQUIRE(r.reasons.size() == 1);
    CHECK_THAT(r.reasons[0], Contains("systematic error +0.015 %") && Contains("+/-0.01 %"));
  }
}

TEST_CASE("Evaporation loss is added to every weighing exactly", "[pipette]") {
  // With 0.02 mg added to each of the ten weighings: mean 99.731 + 0.02 = 99.751 mg, SD unchanged
  // (0.1045041 mg); mean volume = 99.751 * 1.0028509 = 100.03538 uL.
  auto in = fixed_100ul_run();
  in.evaporation_per_weighing = plumb::ExactMass::parse("0.02 mg", "evaporation");
  const auto r = ck::evaluate_pipette_run(in);
  const auto& c = r.volumes.at(0).channels.at(0);
  CHECK_THAT(c.mean_mass, mass_near(mg(99.751), ug(1e-6)));
  CHECK_THAT(c.sd_mass, mass_near(mg(0.1045041), ug(5e-5)));
  CHECK_THAT(c.mean, volume_near(Volume::microlitres(100.03538), ul(0.000005)));
  REQUIRE(r.evaporation_per_weighing);
}

TEST_CASE("Default ISO 8655-6 test volumes", "[pipette]") {
  ck::PipetteDefinition p;
  p.nominal = exact_ul("100");
  CHECK(ck::default_test_volumes(p) == std::vector<plumb::ExactVolume>{exact_ul("100")});
  p.kind = ck::PipetteKind::variable;
  p.lower_limit = exact_ul("10");
  CHECK(ck::default_test_volumes(p) ==
        std::vector<plumb::ExactVolume>{exact_ul("100"), exact_ul("50"), exact_ul("10")});
  p.lower_limit = exact_ul("2");  // 10 % = 10 uL is above the lower limit
  CHECK(ck::default_test_volumes(p) ==
        std::vector<plumb::ExactVolume>{exact_ul("100"), exact_ul("50"), exact_ul("10")});
  p.nominal = exact_ul("1000");
  p.lower_limit = exact_ul("200");  // lower limit 200 uL is above 10 % = 100 uL
  CHECK(ck::default_test_volumes(p) ==
        std::vector<plumb::ExactVolume>{exact_ul("1000"), exact_ul("500"), exact_ul("200")});
  p.nominal = exact_ul("2.5");
  p.lower_limit = exact_ul("0.1");
  CHECK(ck::default_test_volumes(p) ==
        std::vector<plumb::ExactVolume>{exact_ul("2.5"), exact_ul("1.25"), exact_ul("0.25")});
}

TEST_CASE("Multichannel: limits doubled, results per channel, every channel required", "[pipette]") {
  // 2-channel fixed 100 uL pipette. Channel 2 reads 0.90 mg more on every weighing: mean 99.731 + 0.90
  // = 100.631 mg; mean volume = 100.631 * 1.0028509 = 100.631 + 100.631 * 0.0028509 = 100.91789 uL;
  // e_s = +0.918 uL: beyond the single-channel 0.8 uL but within the doubled 1.6 uL, so it passes.
  auto in = fixed_100ul_run();
  in.pipette.channels = 2;
  in.volumes = {{exact_ul("100"), {{2, grams(shifted(ten, 90))}, {1, grams(ten)}}}};
  const auto r = ck::evaluate_pipette_run(in);
  REQUIRE(r.volumes.at(0).channels.size() == 2);
  const auto& c1 = r.volumes[0].channels[0];
  const auto& c2 = r.volumes[0].channels[1];
  CHECK(c1.channel == 1);
  CHECK(c2.channel == 2);
  CHECK_THAT(c2.mean, volume_near(Volume::microlitres(100.91789), ul(0.000005)));
  CHECK_THAT(c2.systematic_error, volume_near(Volume::microlitres(0.91789), ul(0.000005)));
  CHECK_THAT(c2.random_error,
             volume_near(Volume::microlitres(0.1048020), ul(0.0000005)));  // a shift leaves the SD as in the example
  CHECK(c2.limits.doubled);
  CHECK_THAT(c2.limits.systematic, volume_near(Volume::microlitres(1.6), ul(1e-9)));
  CHECK(c2.verdict == Verdict::pass);
  CHECK(r.verdict == Verdict::pass);

  SECTION("the same shift on a single-channel pipette fails") {
    in.pipette.channels = 1;
    in.volumes = {{exact_ul("100"), {{1, grams(shifted(ten, 90))}}}};
    const auto r1 = ck::evaluate_pipette_run(in);
    CHECK(r1.verdict == Verdict::fail);
    CHECK_THAT(r1.reasons.at(0), Contains("systematic error +0.918 uL") && Contains("+/-0.800 uL"));
  }
  SECTION("a channel left out makes the run incomplete and it cannot pass") {
    in.volumes = {{exact_ul("100"), {{1, grams(ten)}}}};
    const auto r2 = ck::evaluate_pipette_run(in);
    CHECK_FALSE(r2.complete);
    CHECK(r2.verdict == Verdict::fail);
    CHECK(r2.volumes.at(0).channels.at(0).verdict == Verdict::pass);
    CHECK_THAT(r2.reasons.at(0), Contains("channel(s) 2 not tested at 100 uL"));
  }
}

TEST_CASE("Variable pipette: absolute limits at nominal across the range, missing volumes reported", "[pipette]") {
  // Variable 100 uL (10-100 uL). At 50 uL the worked-example weighings halved would be another case; here
  // the 100 uL data are reused at 100 uL, and at 50 uL and 10 uL data chosen so the errors are easy by hand.
  // 50 uL: ten weighings of 49.80 mg -> V = 49.80 * 1.0028509 = 49.94198 uL, e_s = -0.05802 uL, s = 0:
  //   within 0.8 uL (the nominal's absolute limit; as % it is 1.6 % at 50 uL). Pass.
  // 10 uL needs a 0.001 mg balance (ISO 8655-6 Table 1), so a 0.01 mg balance is refused for the 10 uL volume.
  auto in = fixed_100ul_run();
  in.pipette.kind = ck::PipetteKind::variable;
  in.pipette.lower_limit = exact_ul("10");
  std::vector<std::string> fifty(10, "0.04980");
  in.volumes = {{exact_ul("50"), {{1, grams(fifty)}}}, {exact_ul("100"), {{1, grams(ten)}}}};
  const auto r = ck::evaluate_pipette_run(in);
  REQUIRE(r.volumes.size() == 2);
  CHECK(r.volumes[0].selected == exact_ul("100"));  // largest first
  const auto& c50 = r.volumes[1].channels.at(0);
  CHECK_THAT(c50.mean, volume_near(Volume::microlitres(49.94198), ul(0.000005)));
  CHECK_THAT(c50.systematic_error, volume_near(Volume::microlitres(-0.05802), ul(0.000005)));
  CHECK(c50.random_error.ul() == 0.0);
  CHECK_THAT(c50.limits.systematic, volume_near(Volume::microlitres(0.8), ul(1e-9)));
  CHECK_THAT(c50.limits.systematic_pct, percent_near(1.6, pp(1e-9)));
  CHECK(c50.verdict == Verdict::pass);
  CHECK_FALSE(r.complete);
  CHECK(r.verdict == Verdict::fail);
  REQUIRE(r.reasons.size() == 1);
  CHECK_THAT(r.reasons[0], Contains("test volume 10 uL was not tested"));

  in.volumes.push_back({exact_ul("10"), {{1, grams(std::vector<std::string>(10, "0.00998"))}}});
  CHECK_THROWS_WITH(ck::evaluate_pipette_run(in),
                    Contains("not suitable") && Contains("0.001 mg") && Contains("10 uL"));
}

TEST_CASE("Bad input is refused with one clear sentence", "[pipette][bad-input]") {
  auto in = fixed_100ul_run();
  SECTION("water temperature outside 15-30 degC") {
    in.environment.water_temperature_c = 31.0;
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("water temperature 31 degC"));
  }
  SECTION("test volume outside a fixed pipette's volume") {
    in.volumes[0].volume = exact_ul("50");
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in),
                      Contains("test volume 50 uL is outside the range of pipette P-100 (fixed at 100 uL)"));
  }
  SECTION("test volume outside a variable pipette's range") {
    in.pipette.kind = ck::PipetteKind::variable;
    in.pipette.lower_limit = exact_ul("10");
    in.volumes[0].volume = exact_ul("150");
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("150 uL is outside") && Contains("10 uL to 100 uL"));
    in.volumes[0].volume = exact_ul("5");
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("5 uL is outside"));
  }
  SECTION("fewer than 4 replicates") {
    in.volumes[0].channels[0].weighings = grams({"0.09971", "0.09965", "0.09980"});
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in),
                      Contains("channel 1: 3 weighing(s) given") && Contains("at least 4"));
  }
  SECTION("4 replicates are accepted, with a note") {
    in.volumes[0].channels[0].weighings = grams({"0.09971", "0.09965", "0.09980", "0.09958"});
    const auto r = ck::evaluate_pipette_run(in);
    CHECK_THAT(r.notes.at(0), Contains("Fewer than 10 replicates"));
  }
  SECTION("channel number above the channel count") {
    in.volumes[0].channels[0].channel = 3;
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("channel 3 does not exist") && Contains("1 channel"));
    in.volumes[0].channels[0].channel = 0;
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("channel 0 does not exist"));
  }
  SECTION("a weighing with more decimals than the balance shows") {
    in.volumes[0].channels[0].weighings[6] = {"0.099693", MassUnit::g, dec("0.099693")};
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in),
                      Contains("weighing 7 (0.099693 g) has more decimals than the readability 0.01 mg"));
    // The same value in mg with the balance's decimals is accepted: 99.69 mg.
    in.volumes[0].channels[0].weighings[6] = {"99.69", MassUnit::mg, dec("99.69")};
    CHECK_NOTHROW(ck::evaluate_pipette_run(in));
  }
  SECTION("a weighing that is not positive") {
    in.volumes[0].channels[0].weighings[2] = {"0.00000", MassUnit::g, dec("0.00000")};
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("weighing 3 (0.00000 g) is not a positive mass"));
  }
  SECTION("test volume or channel given twice") {
    in.volumes.push_back(in.volumes[0]);
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("test volume 100 uL is given twice"));
    in.volumes.pop_back();
    in.volumes[0].channels.push_back(in.volumes[0].channels[0]);
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("channel 1 is given twice"));
  }
  SECTION("negative evaporation") {
    in.evaporation_per_weighing = plumb::ExactMass::parse("-0.01 mg", "evaporation");
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("evaporation loss") && Contains("negative"));
  }
  SECTION("balance unsuitable, out of service or out of date") {
    in.balance.readability = plumb::ExactMass::parse("0.1 mg", "readability");
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("not suitable") && Contains("readability 0.1 mg"));
    in.balance.readability = plumb::ExactMass::parse("0.01 mg", "readability");
    in.balance.due = plumb::parse_date("2026-01-31");
    in.run_date = plumb::parse_date("2026-02-01");
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("out of date"));
    in.run_date = plumb::parse_date("2026-01-31");
    CHECK_NOTHROW(ck::evaluate_pipette_run(in));
    in.balance.in_service = false;
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("out of service"));
  }
  SECTION("inconsistent pipette definitions") {
    in.pipette.kind = ck::PipetteKind::variable;
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("needs the lower limit"));
    in.pipette.lower_limit = exact_ul("100");
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("below the nominal volume"));
    in.pipette.kind = ck::PipetteKind::fixed;
    in.pipette.lower_limit.reset();
    in.pipette.channels = 0;
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("channel count 0"));
    in.pipette.channels = 1;
    in.pipette.nominal = exact_ul("300");
    in.volumes[0].volume = exact_ul("300");
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("300 uL is not a row of ISO 8655-2"));
  }
  SECTION("no test volumes") {
    in.volumes.clear();
    CHECK_THROWS_WITH(ck::evaluate_pipette_run(in), Contains("no test volumes"));
  }
}

TEST_CASE("Boundary: a CV exactly at the lab limit passes, a limit one digit lower fails", "[pipette][boundary]") {
  // Weighings (mg) 100.03 99.97 100.03 99.97 and six of 100.00, worked by hand: mean 100.00 mg, deviations
  // +-0.03 four times, SS = 4 x 0.0009 = 0.0036 mg^2, s^2 = 0.0036 / 9 = 0.0004, s = 0.02 mg exactly.
  // CV = 100 x s / mean = 0.02 % (Z cancels, ISO 8655-6 random error as a CV). Simple acceptance
  // (ILAC G8:09/2019): on the limit passes.
  auto in = fixed_100ul_run();
  in.volumes = {{exact_ul("100"),
                 {{1, grams({"0.10003", "0.09997", "0.10003", "0.09997", "0.10000", "0.10000", "0.10000", "0.10000",
                             "0.10000", "0.10000"})}}}};
  in.pipette.limits = {pl::LimitsPolicy::Kind::lab_pct, dec("1"), dec("0.02")};
  const auto at_limit = ck::evaluate_pipette_run(in);
  REQUIRE(at_limit.volumes.size() == 1);
  CHECK_THAT(at_limit.volumes[0].channels[0].cv_pct, percent_near(0.02, pp(1e-12)));
  CHECK(at_limit.verdict == Verdict::pass);

  in.pipette.limits = {pl::LimitsPolicy::Kind::lab_pct, dec("1"), dec("0.019")};
  CHECK(ck::evaluate_pipette_run(in).verdict == Verdict::fail);
}

TEST_CASE("pipette budget: the balance's calibration U(E) at the weighed load replaces the readability term",
          "[pipette][uncertainty]") {
  // The worked example above, weighed on a balance whose calibration (EURAMET cg-18) states U(E) = 0.04 mg (k = 2)
  // at 0.05 g and U(E) = 0.06 mg (k = 2) at 0.2 g (invented numbers). The mean weighing m = 99.731 mg lies between
  // them: u = 0.02 + (0.03 - 0.02) x (0.099731 - 0.05) / (0.2 - 0.05) = 0.02 + 0.01 x 0.33154 = 0.0233154 mg
  // (linear interpolation, checks/balance_weighing_u.hpp). u(E) holds the rounding of d at zero and load, so the
  // readability line is left out. Contributions to u(V) in uL (GUM 5.1.2, V = Z m, ISO 8655-6 method):
  //   repeatability of the mean  0.0331413184 (as above)
  //   balance calibration        0.0233154 x 1.0028509 = 0.0233818699
  //   water temperature 0.0023472493, air density 0.0008781170, water density formula 0.0000421325 (as above)
  //   u_c = sqrt(sum of squares) = 0.0406366985 uL, U(e_s) = 2 u_c = 0.0812733971 uL.
  auto in = fixed_100ul_run();
  ck::BalanceCalibrationUse cal;
  cal.balance_id = "B-7";
  cal.run_id = 4;
  cal.performed_on = plumb::parse_date("2026-10-01", "date");
  cal.certificate = "CC-2026-0004";
  cal.loads = {{plumb::Mass::grams(0.2), plumb::Mass::milligrams(0.06), 2.0},
               {plumb::Mass::grams(0.05), plumb::Mass::milligrams(0.04), 2.0}};
  in.balance_calibration = cal;
  const ck::PipetteRunResult r = ck::evaluate_pipette_run(in);
  const auto& lines = r.volumes.at(0).channels.at(0).uncertainty.budget.lines;
  REQUIRE(lines.size() == 5);
  CHECK_THAT(lines[1].input.source, Contains("balance calibration"));
  CHECK(lines[1].contribution == Approx(0.0233818699).margin(5e-9).epsilon(0));
  CHECK_THAT(lines[1].input.note,
             Contains("calibration run 4 of 2026-10-01 (certificate CC-2026-0004)") && Contains("interpolated"));
  for (const auto& l : lines) CHECK_THAT(l.input.source, !Contains("readability"));
  CHECK_THAT(r.volumes.at(0).channels.at(0).uncertainty.systematic_expanded,
             volume_near(Volume::microlitres(0.0812733971), ul(5e-8)));

  // Without a calibration the readability line is the fallback, and it says why.
  auto bare = fixed_100ul_run();
  bare.no_balance_calibration = "no calibration of balance B-7 recorded on or before 2026-11-30";
  const ck::PipetteRunResult without = ck::evaluate_pipette_run(bare);
  const auto& fallback = without.volumes.at(0).channels.at(0).uncertainty.budget.lines;
  REQUIRE(fallback.size() == 5);
  CHECK_THAT(fallback[1].input.source, Contains("readability"));
  CHECK_THAT(fallback[1].input.note, Contains("no calibration of balance B-7") && Contains("fallback"));
}
