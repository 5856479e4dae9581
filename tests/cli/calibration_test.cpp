// End to end: a full balance calibration recorded, shown, certified and scheduled through the built binary.
// The key numbers are worked by hand below from the published formulas (EURAMET cg-18 v4.0 sections 7.1 and
// 7.2, GUM JCGM 100:2008, least squares for a straight line, OIML R 76-1 Table 6 and R 111-1 Annex E).
#include <catch2/catch.hpp>

#include <algorithm>

#include <nlohmann/json.hpp>

#include "support/margin.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::grams_near;
using plumb::test::run_plumb;
using plumb::test::ug;

namespace {

// The example lab and run file are in tests/support/run_plumb.hpp: BAL-C, four E2 weights with zero correction
// (conventional mass = nominal, so every E below is the reading minus the nominal value), E = +0.1, +0.2, +0.4,
// +0.6, +0.8 mg.
using plumb::test::calibration_lab;
using plumb::test::calibration_run_file;

}  // namespace

TEST_CASE("calibration: record, show with budget and fit, error at a load, certificate, due", "[cli][calibration]") {
  plumb::test::ScratchDir dir;
  const auto db = calibration_lab(dir).string();
  dir.write("cal.csv", calibration_run_file());
  auto r = run_plumb({"--db",        db,           "check",        "record",        "BAL-C",     "--procedure",
                      "calibration", "--readings", "cal.csv",      "--temperature", "20C",       "--pressure",
                      "1013.25hPa",  "--humidity", "50%",          "--air-formula", "oiml-r111", "--on",
                      "2026-11-30",  "--as",       "A. Technician"},
                     dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("Verdict: PASS"));

  r = run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json j = json::parse(r.out);
  CHECK(j["procedure"] == "calibration");
  CHECK(j["verdict"] == "pass");
  CHECK(j["next_due"] == "2027-11-30");  // 2026-11-30 + 1y (--calibrate-every)

  // Air density, OIML R 111-1 Annex E (E.3-1), by hand at t = 20 degC, p = 1013.25 hPa, h = 50 %:
  //   0.34848 x 1013.25 = 353.09736; 0.009 x 50 x exp(0.061 x 20) = 0.45 x exp(1.22) = 0.45 x 3.387188 = 1.524235
  //   rho_a = (353.09736 - 1.524235) / 293.15 = 351.573125 / 293.15 = 1.199294 kg/m3
  CHECK(j["environment"]["air_density_kg_m3"].get<double>() == Approx(1.199294).epsilon(2e-6));

  const json& loads = j["as_found"]["loads"];
  REQUIRE(loads.size() == 5);
  // E = I - m_ref with one reading and m_ref = nominal (zero corrections; 8000 kg/m3 weights have no buoyancy
  // correction since 1/rho - 1/rho_c = 0, cg-18 7.1.2.2): exact decimals.
  const std::vector<std::string> exact = {"0.0001", "0.0002", "0.0004", "0.0006", "0.0008"};
  for (std::size_t i = 0; i < 5; ++i) {
    INFO("load " << i + 1);
    CHECK(loads[i]["error_exact_g"] == exact[i]);
  }

  // Budget at load 3 (W100, one reading), by hand, in mg (EURAMET cg-18 7.1; GUM 4.3.7 for rectangular):
  //   rounding at zero, at load: 0.1 / (2 sqrt 3) = 0.0288675 each (squares 8.33333e-4)
  //   repeatability: deviations from the mean 100.00035 are +/-0.05; s^2 = 10 x 0.0025 / 9 = 2.777778e-3,
  //     s = 0.0527046, divided by sqrt(1) (one reading at the load), dof 9
  //   eccentricity: |dI|max = 0.2 at L_ecc = 100 g; at L = 100 g the half-width is 0.2 / (2 x 100) x 100 = 0.1,
  //     u = 0.1 / sqrt 3 = 0.0577350 (square 3.333333e-3)
  //   reference weight W100: U / k = 0.05 / 2 = 0.025 (square 6.25e-4); drift 0 (one certificate, no allowance)
  //   air buoyancy (EURAMET cg-18 v4.0, GUM 5.1.2 second-order term): no density entered, so 8000 kg/m3 with
  //     u(rho) = 210 / sqrt 3 = 121.2435565 kg/m3 (OIML R 111-1:2004 Table 5, E2 >= 100 g: 7810 to 8210, from
  //     memory); rho_a = 1.1992943 kg/m3 (below) with the OIML formula's own u 2e-4 x rho_a = 2.398589e-4 kg/m3:
  //     100 g x (1.2 - 1.1992943) x 121.2435565 / 8000^2 = 1.336890e-7 g and 100 g x 2.398589e-4 x 121.2435565
  //     / 8000^2 = 4.543960e-8 g, u = 1.4120024e-7 g = 1.4120024e-4 mg (square 1.99375e-8 mg^2)
  //   u_c^2 = 1.666667e-3 + 2.777778e-3 + 3.333333e-3 + 6.25e-4 + 1.99375e-8 = 8.402798e-3, u_c = 0.09166678 mg
  //     (121/14400 mg^2 without the buoyancy term: 11/120 mg)
  //   nu_eff = 9 x (8.402798e-3 / 2.777778e-3)^2 = 82.356016 (Welch-Satterthwaite)
  //   k: GUM Table G.2 at 95.45 % gives 2.05 for nu = 50 and 2.03 for nu = 100, so 2.03 < k < 2.05
  //   U = k u_c: between 2.03 x 0.0916667 = 0.18608 and 2.05 x 0.0916667 = 0.18792 mg
  const json& w100 = loads[2];
  const json& lines = w100["budget"]["lines"];
  json ecc_line;
  for (const auto& l : lines)
    if (l["source"] == "eccentricity") ecc_line = l;
  REQUIRE(ecc_line.is_object());
  CHECK_THAT(ecc_line["value"].get<double>(), grams_near(0.0001, ug(1e-7)));  // half-width
  CHECK(ecc_line["divisor"].get<double>() == Approx(1.7320508).epsilon(1e-7));
  CHECK_THAT(ecc_line["contribution_g"].get<double>(), grams_near(0.0000577350269, ug(0.00005)));  // 0.1 mg / sqrt 3
  CHECK_THAT(w100["u_c_g"].get<double>(), grams_near(9.166677541665e-5, ug(1e-5)));
  CHECK(w100["nu_eff"].get<double>() == Approx(82.35601582).margin(1e-5).epsilon(0));
  CHECK(w100["k"].get<double>() > 2.03);
  CHECK(w100["k"].get<double>() < 2.05);
  CHECK(w100["U_g"].get<double>() > 0.00018608);
  CHECK(w100["U_g"].get<double>() < 0.00018792);
  // OIML R 76-1 Table 6 (from memory, cross-checked in tests/reference): class I, e = 1 mg, 100 g = 100 000 e lies
  // in 50 000 e < m <= 200 000 e: 1 e on initial verification, 2 e = 2 mg in service. At 20 g (20 000 e): 1 mg.
  CHECK_THAT(w100["tolerance_g"].get<double>(), grams_near(0.002, ug(0.001)));
  CHECK_THAT(loads[0]["tolerance_g"].get<double>(), grams_near(0.001, ug(0.001)));
  CHECK(w100["state"] == "pass");

  // Straight line of I on m, by hand through E = I - m (same residuals; slope of I = 1 + slope of E), mg and g:
  //   x = 20, 50, 100, 150, 200: mean 104, Sxx = 84^2 + 54^2 + 4^2 + 46^2 + 96^2 = 21320
  //   E = 0.1, 0.2, 0.4, 0.6, 0.8: mean 0.42; SxE = 26.88 + 11.88 + 0.08 + 8.28 + 36.48 = 83.6
  //   slope of E = 83.6 / 21320 = 0.00392120 mg/g = 3.92120e-6 -> b1 = 1.00000392120
  //   intercept = 0.42 - 0.00392120 x 104 = 0.0121951 mg (exactly 1/82 mg) -> b0 = 1.21951e-5 g
  //   residuals: 0.1 - (0.0121951 + 0.0784240) = +0.0093809, -0.0082552, -0.0043152, -0.0003752, +0.0035647 mg
  //   SSE = 8.80006e-5 + 6.81477e-5 + 1.86209e-5 + 1.4080e-7 + 1.27073e-5 = 1.876172e-4 mg^2
  //   RMSE = sqrt(SSE / 5) = 6.12564e-3 mg; residual SD = sqrt(SSE / 3) = 7.90817e-3 mg
  //   SE(b1) = residual SD / sqrt(Sxx) = 7.90817e-6 g / 146.0137 g = 5.41604e-8
  const json& fit = j["as_found"]["fit"];
  CHECK(fit["model"] == "line");
  CHECK(fit["coef"][1].get<double>() == Approx(1.0000039212).epsilon(1e-12));
  // Masses to 1e-5 ug (1e-11 g): far below d, above the rounding of a fit of readings near 200 g.
  CHECK_THAT(fit["coef"][0].get<double>(), grams_near(1.2195121951e-5, ug(1e-5)));
  CHECK(fit["coef_se"][1].get<double>() == Approx(5.41604e-8).epsilon(1e-4));
  CHECK_THAT(fit["rmse_g"].get<double>(), grams_near(6.125638918e-6, ug(1e-5)));
  CHECK_THAT(fit["residual_sd_g"].get<double>(), grams_near(7.908165839e-6, ug(1e-5)));
  CHECK_THAT(fit["residuals_g"][0].get<double>(), grams_near(9.380863039e-6, ug(1e-5)));

  // Interpolated error at 120 g: 0.0121951 + 0.0039212 x 120 = 0.482739 mg (1/82 + 120 x 83.6/21320 =
  // 0.48273921 mg).
  r = run_plumb({"--db", db, "check", "show", "LAST", "--at", "120g", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json at = json::parse(r.out);  // the answer at that load only, not the whole run
  CHECK_THAT(at["error_g"].get<double>(), grams_near(0.00048273921201, ug(1e-5)));
  CHECK(at["extrapolated"] == false);
  CHECK(at["run_id"] == j["run_id"]);
  CHECK(at["instrument"] == "BAL-C");
  // 120 g lies between the calibrated loads 3 (100 g) and 4 (150 g): their E and U as stated for the run.
  REQUIRE(at["nearest_calibrated_loads"].size() == 2);
  CHECK(at["nearest_calibrated_loads"][0]["index"] == 3);
  CHECK(at["nearest_calibrated_loads"][1]["index"] == 4);
  CHECK(at["nearest_calibrated_loads"][0]["U_g"] == w100["U_g"]);
  r = run_plumb({"--db", db, "check", "show", "LAST", "--at", "120g"}, dir.path());
  REQUIRE(r.status == 0);
  // A few lines: the run, the error at the load (0.48 mg to d / 10 = 0.01 mg), the error and uncertainty over the
  // range with its two formulas (EURAMET cg-18 v4.0), the two loads beside it, a note.
  CHECK(std::count(r.out.begin(), r.out.end(), '\n') == 7);
  CHECK_THAT(r.out, Catch::Contains("over the range (EURAMET cg-18 v4.0, straight line with offset)"));
  CHECK_THAT(r.out, Catch::Contains("fitted error at 120 g: E = +0.48 mg"));
  CHECK_THAT(r.out, Catch::Contains("calibrated load 3 (100"));
  // 210 g lies outside the calibrated 20-200 g: refused, or shown marked as extrapolated.
  r = run_plumb({"--db", db, "check", "show", "LAST", "--at", "210g"}, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("extrapolation"));
  r = run_plumb({"--db", db, "check", "show", "LAST", "--at", "210g", "--extrapolate"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("EXTRAPOLATED"));

  // The text view prints the budget table and the model.
  r = run_plumb({"--db", db, "check", "show", "LAST"}, dir.path());
  REQUIRE(r.status == 0);
  for (const char* must : {"Uncertainty budget", "eccentricity", "rectangular", "Fitted model (line)", "RMSE",
                           "front-left", "W100+W50"}) {
    INFO(must);
    CHECK_THAT(r.out, Catch::Contains(must));
  }

  // The structure went to the calibration tables too (migration 003).
  const std::string dump = plumb::test::dump_database(db);
  CHECK_THAT(dump, Catch::Contains("INSERT INTO calibration_runs"));
  CHECK_THAT(dump, Catch::Contains("'W100+W50'"));
  CHECK_THAT(dump, Catch::Contains("'front-left'"));

  r = run_plumb({"--db", db, "certificate", "issue", "LAST", "--as", "Q. Manager"}, dir.path());
  REQUIRE(r.status == 0);
  for (const char* must : {"BALANCE CALIBRATION CERTIFICATE", "CC-", "RC-W20", "RC-W200", "U = k u_c",
                           "ILAC G8", "simple acceptance", "As found", "No adjustment was made", "1.1993 kg/m3",
                           "VERDICT: PASS", "2027-11-30", "does not replace, accredited calibration"}) {
    INFO(must);
    CHECK_THAT(r.out, Catch::Contains(must, Catch::CaseSensitive::No));
  }
  r = run_plumb({"--db", db, "certificate", "show", "LAST", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json cert = json::parse(r.out);
  CHECK(cert["kind"] == "balance_calibration");
  CHECK_THAT(cert["uncertainty_statement"].get<std::string>(), Catch::Contains("coverage probability of about 95 %"));
  CHECK(cert["calibration"]["stages"][0]["error_of_indication"].size() == 5);
  CHECK(cert["weights"].size() == 4);

  // Calibration due beside the weekly check, each on its own schedule.
  r = run_plumb({"--db", db, "due", "--on", "2026-12-01", "--all", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  bool seen = false;
  const json due = json::parse(r.out);
  for (const auto& item : due["items"])
    if (item["kind"] == "calibration") {
      seen = true;
      CHECK(item["due_on"] == "2027-11-30");
      CHECK(item["status"] == "in date");
    }
  CHECK(seen);
}

TEST_CASE("calibration: guard band states, a failed as-left puts the balance out of service", "[cli][calibration]") {
  plumb::test::ScratchDir dir;
  const auto db = calibration_lab(dir, "guard-band").string();
  // W200 read 200.0021: E = +2.1 mg against 2 mg in service; U there is about 0.3 mg, so the interval
  // [1.8, 2.4] mg straddles the limit: "fail, not proven" (ILAC G8 guard band w = U).
  std::string csv = calibration_run_file("200.0021");
  // As left: the same, still reading high at 200 g (adjustment did not help).
  csv += "as-left,indication,W20,,up,20.0001,g\nas-left,indication,W50,,up,50.0002,g\n"
         "as-left,indication,W100,,up,100.0004,g\nas-left,indication,W100+W50,,up,150.0006,g\n"
         "as-left,indication,W200,,up,200.0025,g\n";
  dir.write("cal.csv", csv);
  auto r = run_plumb({"--db", db, "check", "record", "BAL-C", "--procedure", "calibration", "--readings", "cal.csv",
                      "--on", "2026-11-30", "--as", "A. Technician", "--format", "json", "--gate"},
                     dir.path());
  INFO(r.err);
  CHECK(r.status == 1);  // --gate: the calibration failed
  const json j = json::parse(r.out);
  CHECK(j["as_found"]["loads"][4]["state"] == "fail, not proven");
  CHECK(j["as_left"]["loads"][4]["state"] == "fail");  // 2.5 mg - U (about 0.3) > 2 mg
  CHECK(j["as_left"]["loads"][2]["state"] == "pass");
  CHECK(j["verdict"] == "fail");
  CHECK(j["next_due"].is_null());
  // Air not measured: cg-18 with plumb's stated assumption 1.2 kg/m3 +/- 10 %.
  CHECK(j["environment"]["air_method"] == "assumed");

  r = run_plumb({"--db", db, "due", "--on", "2026-12-01", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  int out_of_service = 0;
  const json due = json::parse(r.out);
  for (const auto& item : due["items"])
    if (item["id"] == "BAL-C" && item["status"] == "out of service") ++out_of_service;
  CHECK(out_of_service == 2);  // the weekly-check line and the calibration line

  r = run_plumb({"--db", db, "certificate", "issue", "LAST"}, dir.path());
  REQUIRE(r.status == 0);
  for (const char* must :
       {"fail, not proven", "guard band", "OUT OF SERVICE", "as found fail, not proven, as left fail"}) {
    INFO(must);
    CHECK_THAT(r.out, Catch::Contains(must));
  }
}
