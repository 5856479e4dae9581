// End to end: the error and uncertainty over the range from a recorded calibration (`check show --at`), the terms
// of normal use of a balance (`balance set-in-use`, history kept) and what follows from them (`balance in-use`):
// U(W), the minimum weight from calibration beside the USP <41> one, and which binds. The calibration is the
// example of tests/cli/calibration_test.cpp (E = +0.1, +0.2, +0.4, +0.6, +0.8 mg at 20, 50, 100, 150, 200 g).
#include <catch2/catch.hpp>

#include <cctype>
#include <cmath>

#include <nlohmann/json.hpp>

#include "support/margin.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::grams_near;
using plumb::test::run_plumb;
using plumb::test::ug;

namespace {

// Text renderings wrap long values at spaces; what they say is compared without whitespace.
std::string squeezed(const std::string& s) {
  std::string out;
  for (char c : s)
    if (!std::isspace(static_cast<unsigned char>(c))) out += c;
  return out;
}

std::string record_calibration(plumb::test::ScratchDir& dir) {
  const auto db = plumb::test::calibration_lab(dir).string();
  dir.write("cal.csv", plumb::test::calibration_run_file());
  const auto r = run_plumb({"--db", db, "check", "record", "BAL-C", "--procedure", "calibration", "--readings",
                            "cal.csv", "--on", "2026-11-30", "--as", "A. Technician"},
                           dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  return db;
}

}  // namespace

TEST_CASE("check show --at gives the error and uncertainty over the range (EURAMET cg-18 v4.0)",
          "[cli][calibration][range]") {
  plumb::test::ScratchDir dir;
  const auto db = record_calibration(dir);
  const auto r = run_plumb({"--db", db, "check", "show", "LAST", "--at", "120g", "--format", "json"}, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const json at = json::parse(r.out);
  const json& o = at["over_range"];
  CHECK(o["form"] == "straight line with offset");  // the run's model is `line`
  // E against the reading R: R_j = m_j + E_j shifts x by at most 0.8 mg, so by hand with x = m (as in
  // calibration_test): xbar = 104 g, Sxx = 21320 g^2, Sxy = 83.6 mg g, a1 = 3.92120e-6, a0 = 0.42 - 104 x a1 =
  // 0.012195 mg; at R = 120.00048 g, E = 0.012195 + 120 x 0.0039212 = 0.48274 mg.
  CHECK_THAT(o["error_g"].get<double>(), grams_near(4.8274e-4, ug(0.05)));
  // u at any reading covers the budget of the nearest calibrated loads, here the one at 100 g below and 150 g above
  // only in part: it must cover at least the u_c of the calibrated load at 100 g (u grows with R).
  const auto show = run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path());
  const json run = json::parse(show.out);
  CHECK(o["u_g"].get<double>() >= run["as_found"]["loads"][2]["u_c_g"].get<double>());
  CHECK(o["U_g"].get<double>() == Approx(o["k"].get<double>() * o["u_g"].get<double>()).margin(1e-12).epsilon(0));
  // Outside the calibrated range it refuses, as before.
  const auto out = run_plumb({"--db", db, "check", "show", "LAST", "--at", "210g"}, dir.path());
  CHECK(out.status == 2);

  // The certificate states the approximation with its coefficients.
  const auto issued = run_plumb({"--db", db, "certificate", "issue", "LAST", "--format", "json"}, dir.path());
  INFO(issued.err);
  REQUIRE(issued.status == 0);
  CHECK_THAT(issued.out, Catch::Contains("range_approximation"));
  const auto text = run_plumb({"--db", db, "certificate", "show", "LAST"}, dir.path());
  CHECK_THAT(squeezed(text.out), Catch::Contains("Errorovertherange") && Catch::Contains("Uncertaintyovertherange") &&
                                     Catch::Contains("EURAMETcg-18v4.0approximation"));
}

TEST_CASE("balance set-in-use keeps history, balance in-use gives U(W) and the minimum weight, by hand",
          "[cli][calibration][in-use]") {
  plumb::test::ScratchDir dir;
  const auto db = record_calibration(dir);
  auto r = run_plumb({"--db", db, "balance", "in-use", "BAL-C", "--on", "2026-12-01", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK(json::parse(r.out)["terms"].is_null());

  const std::vector<std::string> set = {"--db",      db,
                                        "balance",   "set-in-use",
                                        "BAL-C",     "--repeatability",
                                        "0.12mg",    "--temperature-change",
                                        "5K",        "--tk",
                                        "2ppm/K",    "--air-density-u",
                                        "0.05kg/m3", "--sample-density",
                                        "1000kg/m3", "--sample-density-u",
                                        "50kg/m3",   "--drift",
                                        "10ppm",     "--required-accuracy",
                                        "0.1%",      "--safety-factor",
                                        "2",         "--corrected",
                                        "--reason",  "first terms"};
  r = run_plumb(set, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  auto second = set;
  second[6] = "0.15mg";
  second.back() = "repeatability measured again";
  r = run_plumb(second, dir.path());
  REQUIRE(r.status == 0);

  r = run_plumb({"--db", db, "balance", "in-use", "BAL-C", "--on", "2026-12-01", "--format", "json"}, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const json j = json::parse(r.out);
  REQUIRE(j["terms_history"].size() == 2);
  CHECK(j["terms_history"][0]["repeatability_g"] == "0.00012");
  CHECK(j["terms"]["repeatability_g"] == "0.00015");
  CHECK(j["terms"]["reason"] == "repeatability measured again");
  const json& u = j["in_use"];
  // Absolute terms by hand: d_0 = d_L = d = 0.1 mg -> 0.1 / (2 sqrt 3) = 0.02886751 mg each; s = 0.15 mg.
  CHECK_THAT(u["terms"][0]["u"].get<double>(), grams_near(2.886751e-5, ug(0.0001)));
  CHECK_THAT(u["terms"][2]["u"].get<double>(), grams_near(1.5e-4, ug(0.0001)));
  // Relative: 2e-6 x 5 / (2 sqrt 3) = 2.886751e-6; buoyancy 4.382137e-5 (weighing_in_use_test); 1e-5 / sqrt 3.
  CHECK(u["terms"][3]["u"].get<double>() == Approx(2.886751e-6).margin(1e-12).epsilon(0));
  CHECK(u["terms"][4]["u"].get<double>() == Approx(4.382137e-5).margin(1e-11).epsilon(0));
  CHECK(u["terms"][5]["u"].get<double>() == Approx(5.773503e-6).margin(1e-12).epsilon(0));
  // alpha^2 = alpha_E^2 + 2 x 0.02886751^2 + 0.15^2 mg^2, from the calibration's alpha_E as shown.
  const double alpha_e = j["calibration"]["range_approximation"]["alpha_g"].get<double>();
  CHECK_THAT(u["alpha_g"].get<double>(),
             grams_near(std::sqrt(alpha_e * alpha_e + 2 * 8.333333e-10 + 2.25e-8), ug(0.0001)));
  // Linear form, corrected: W_min = SF a / (A - SF b) with a = k alpha, b = k beta.
  CHECK(u["form"] == "linear");
  const double a = u["a_g"].get<double>(), b = u["b"].get<double>();
  CHECK_THAT(a, grams_near(u["k"].get<double>() * u["alpha_g"].get<double>(), ug(1e-6)));
  CHECK_THAT(u["minimum_weight_g"].get<double>(), grams_near(2 * a / (0.001 - 2 * b), ug(0.01)));
  // No weekly check on BAL-C: the minimum weight from calibration binds, and the output says so.
  CHECK(j["minimum_weight"]["binding"] == "calibration");
  CHECK_THAT(j["minimum_weight"]["statement"].get<std::string>(), Catch::Contains("EURAMET cg-18 v4.0"));
  CHECK_THAT(j["minimum_weight"]["caution"].get<std::string>(), Catch::Contains("local regulations"));

  const auto text = run_plumb({"--db", db, "balance", "in-use", "BAL-C", "--on", "2026-12-01"}, dir.path());
  CHECK_THAT(text.out, Catch::Contains("linear form") && Catch::Contains("minimum weight from calibration") &&
                           Catch::Contains("USP <41> minimum weight"));
}
