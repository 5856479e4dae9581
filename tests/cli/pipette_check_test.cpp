// End to end: a pipette registered, checked gravimetrically on an in-date balance, shown, certified and
// scheduled, through the built binary as a lab user runs it.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include "support/margin.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::grams_near;
using plumb::test::microlitres_near;
using plumb::test::percent_near;
using plumb::test::pp;
using plumb::test::run_plumb;
using plumb::test::ug;
using plumb::test::ul;

namespace {

// SM-02, a 0.01 mg balance, checked with W100 (conventional mass 100.00003 g). Mean 100.000032 g; deviations
// in 0.01 mg: -0.2 +0.8 -1.2 -0.2 +1.8 -0.2 -1.2 +0.8 -0.2 -0.2; squares 5 x 0.04 + 2 x 0.64 + 2 x 1.44 + 3.24
// = 7.6 (x 1e-4 mg^2 = 0.00076 mg^2); s = sqrt(0.00076 / 9) = sqrt(0.000084444) = 0.0091894 mg <= 0.02 mg
// (ISO 8655-6 Table 1 for 10 uL < V <= 100 uL).
const std::string balance_readings =
    "reading\n100.00003\n100.00004\n100.00002\n100.00003\n100.00005\n100.00003\n100.00002\n100.00004\n100.00003\n"
    "100.00003\n";

// The ten weighings of the worked example in tests/unit/pipette_check_test.cpp, as SM-02 shows them in g.
const std::vector<std::string> ten = {"0.09971", "0.09965", "0.09980", "0.09958", "0.09992",
                                      "0.09975", "0.09969", "0.09983", "0.09961", "0.09977"};

std::string weighings(const std::string& volume, int channel, const std::vector<std::string>& readings) {
  std::string csv;
  for (const auto& r : readings) csv += volume + "," + std::to_string(channel) + "," + r + "\n";
  return csv;
}

std::string lab_with_balance(const plumb::test::ScratchDir& dir) {
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("sm02.csv", balance_readings);
  for (const std::vector<std::string>& step :
       {std::vector<std::string>{"--db", db, "balance", "add", "SM-02", "--capacity", "120g", "--readability", "0.01mg",
                                 "--every", "7d", "--smallest-net", "50mg", "--location", "Weighing room", "--since",
                                 "2026-01-05"},
        std::vector<std::string>{"--db", db, "check", "record", "SM-02", "--weight", "W100", "--readings", "sm02.csv",
                                 "--on", "2026-11-30", "--as", "A. Technician"}}) {
    const auto r = run_plumb(step, dir.path());
    REQUIRE(r.status == 0);
  }
  return db;
}

}  // namespace

TEST_CASE("pipette check: register, record, show, certify, due", "[cli][pipette]") {
  plumb::test::ScratchDir dir;
  const auto db = lab_with_balance(dir);

  auto r = run_plumb({"--db", db, "pipette", "add", "P-07", "--nominal", "100uL", "--range", "fixed", "--every", "3mo",
                      "--location", "Lab 2", "--since", "2026-06-01", "--as", "Q. Manager"},
                     dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("P-07") && Catch::Contains("ISO 8655-2:2002") && Catch::Contains("100 uL"));
  r = run_plumb({"--db", db, "pipette", "list", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json list = json::parse(r.out);
  REQUIRE(list.size() == 1);
  CHECK(list[0]["kind"] == "fixed");
  CHECK(list[0]["nominal_ul"] == 100.0);
  CHECK(list[0]["every"] == "3mo");

  // Before any check the pipette is due from its --since date.
  r = run_plumb({"--db", db, "due", "--on", "2026-12-01", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  bool listed = false;
  const json due_before = json::parse(r.out);
  for (const auto& i : due_before["items"])
    if (i["id"] == "P-07") {
      listed = true;
      CHECK(i["kind"] == "pipette");
      CHECK(i["status"] == "overdue");
      CHECK(i["due_on"] == "2026-06-01");
    }
  CHECK(listed);

  dir.write("w.csv", "volume,channel,reading\n" + weighings("100uL", 1, ten));
  r = run_plumb({"--db",      db,           "check",        "record", "P-07",       "--procedure", "gravimetric",
                 "--balance", "SM-02",      "--water-temp", "20C",    "--pressure", "1013hPa",     "--humidity",
                 "50%",       "--readings", "w.csv",        "--on",   "2026-12-01", "--as",        "A. Technician"},
                dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("PASS") && Catch::Contains("2027-03-01"));

  r = run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json j = json::parse(r.out);
  // Expected values worked by hand (pocket calculator) from the published formulas: Tanaka et al. (2001) water
  // density, OIML R 111-1 Annex E air density, ISO 8655-6 Z, ISO 8655-2:2002 Table 1 limits (from memory).
  // The arithmetic, step by step, is in tests/unit/pipette_check_test.cpp ("Worked example by hand"):
  //   rho_w(20 degC) = 998.20675 kg/m3; rho_a(20 degC, 1013 hPa, 50 %) = 1.1989971 kg/m3;
  //   Z = 1000 / (998.20675 - 1.1989971) * (1 - 1.1989971 / 8000) = 1.0028509 uL/mg;
  //   weighings (mg) sum 997.31, mean 99.731; sum of squared deviations 0.098290 mg^2, s = sqrt(0.098290 / 9)
  //   = 0.1045041 mg; mean volume 99.731 * Z = 100.01532 uL; e_s = +0.01532 uL = +0.01532 %;
  //   s_r = 0.1045041 * Z = 0.1048020 uL; CV = 0.1048020 / 100.01532 = 0.10479 %; limits 0.8 uL and 0.3 uL: pass.
  CHECK(j["procedure"] == "gravimetric");
  CHECK(j["instrument"] == "P-07");
  CHECK(j["z"]["water_density_kg_m3"].get<double>() == Approx(998.20675).margin(0.000005).epsilon(0));
  CHECK(j["z"]["air_density_kg_m3"].get<double>() == Approx(1.1989971).margin(0.0000005).epsilon(0));
  CHECK(j["z"]["z_ul_per_mg"].get<double>() == Approx(1.0028509).margin(0.00000005).epsilon(0));
  CHECK(j["environment"]["water_temperature_c"] == 20.0);
  CHECK(j["environment"]["air_pressure_hpa"] == 1013.0);
  CHECK(j["environment"]["humidity_pct"] == 50.0);
  CHECK(j["environment"]["evaporation_g"].is_null());
  CHECK(j["balance"]["id"] == "SM-02");
  CHECK(j["balance"]["latest_check_run"] == 1);
  // The balance's repeatability, worked above: 0.0091894 mg.
  CHECK_THAT(j["balance"]["repeatability_g"].get<double>(), grams_near(0.0000091894, ug(0.00005)));
  REQUIRE(j["volumes"].size() == 1);
  const json& v = j["volumes"][0];
  CHECK(v["selected_ul"] == 100.0);
  REQUIRE(v["channels"].size() == 1);
  const json& c = v["channels"][0];
  CHECK(c["channel"] == 1);
  CHECK(c["n"] == 10);
  // Margins: half a unit in the last digit worked by hand; the limits are exact table values.
  CHECK_THAT(c["mean_ul"].get<double>(), microlitres_near(100.01532, ul(0.000005)));
  CHECK_THAT(c["systematic_error_ul"].get<double>(), microlitres_near(0.01532, ul(0.000005)));
  CHECK_THAT(c["systematic_error_pct"].get<double>(), percent_near(0.01532, pp(0.000005)));
  CHECK_THAT(c["random_error_ul"].get<double>(), microlitres_near(0.1048020, ul(0.0000005)));
  CHECK_THAT(c["cv_pct"].get<double>(), percent_near(0.10479, pp(0.000005)));
  CHECK_THAT(c["limits"]["systematic_ul"].get<double>(), microlitres_near(0.8, ul(1e-9)));
  CHECK_THAT(c["limits"]["random_ul"].get<double>(), microlitres_near(0.3, ul(1e-9)));
  CHECK(c["verdict"] == "pass");
  CHECK(c["reasons"].empty());
  CHECK(j["verdict"] == "pass");
  CHECK(j["complete"] == true);
  CHECK(j["next_due"] == "2027-03-01");
  REQUIRE(j["readings"].size() == 10);
  CHECK(j["readings"][4]["text"] == "0.09992");
  CHECK(j["readings"][4]["series"] == "100 uL channel 1");

  r = run_plumb({"--db", db, "check", "show", "LAST"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("1.0028509") && Catch::Contains("100.015") && Catch::Contains("SM-02"));

  r = run_plumb({"--db", db, "certificate", "issue", "LAST", "--format", "text", "--as", "Q. Manager"}, dir.path());
  REQUIRE(r.status == 0);
  for (const char* must : {"Pipette check certificate", "PC-2026-0001", "Example Analytical Lab", "P-07", "SM-02",
                           "W100", "RC-2291", "1.0028509", "ISO 8655-2:2002", "100.015", "0.09992",
                           "VERDICT: PASS", "2027-03-01", "simple acceptance", "clinical",
                           "does not replace, accredited calibration", "Reviewed by"}) {
    INFO(must);
    CHECK_THAT(r.out, Catch::Contains(must));
  }
  r = run_plumb({"--db", db, "certificate", "show", "PC-2026-0001", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json cert = json::parse(r.out);
  CHECK(cert["kind"] == "pipette_check");
  CHECK(cert["instrument"]["kind"] == "pipette");
  CHECK(cert["balance_used"]["id"] == "SM-02");
  CHECK(cert["balance_used"]["check_run"] == 1);
  CHECK(cert["weights"][0]["id"] == "W100");

  r = run_plumb({"--db", db, "due", "--on", "2027-02-20", "--within", "14d", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  listed = false;
  const json due_after = json::parse(r.out);
  for (const auto& i : due_after["items"])
    if (i["id"] == "P-07") {
      listed = true;
      CHECK(i["status"] == "due");
      CHECK(i["due_on"] == "2027-03-01");
      CHECK(i["days_left"] == 9);  // 2027-02-20 -> 2027-03-01: 8 days left in February + 1
    }
  CHECK(listed);
}

TEST_CASE("pipette check: evaporation, an incomplete multichannel run fails and takes it out of service",
          "[cli][pipette]") {
  plumb::test::ScratchDir dir;
  const auto db = lab_with_balance(dir);
  REQUIRE(run_plumb({"--db", db, "pipette", "add", "P-07", "--nominal", "100uL", "--range", "fixed", "--every",
                     "3mo"},
                    dir.path())
              .status == 0);
  dir.write("w.csv", "volume,reading\n" + [] {
    std::string s;
    for (const auto& r : ten) s += "100," + r + "\n";
    return s;
  }());
  // Evaporation 0.01 mg per weighing: mean mass 99.741 mg; by hand 99.741 * 1.0028509 = 99.741 + 0.284352
  // = 100.02535 uL. The SD does not change: s_r = 0.1048020 uL.
  auto r = run_plumb({"--db",        db,           "check",      "record",        "P-07",          "--procedure",
                      "gravimetric", "--balance",  "SM-02",      "--water-temp",  "20C",           "--pressure",
                      "1013hPa",     "--humidity", "50%",        "--evaporation", "0.01mg",        "--readings",
                      "w.csv",       "--on",       "2026-12-01", "--as",          "A. Technician", "--format",
                      "json"},
                     dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  json j = json::parse(r.out);
  CHECK_THAT(j["environment"]["evaporation_g"].get<double>(), grams_near(0.00001, ug(1e-6)));
  CHECK_THAT(j["volumes"][0]["channels"][0]["mean_ul"].get<double>(), microlitres_near(100.02535, ul(0.000005)));
  CHECK_THAT(j["volumes"][0]["channels"][0]["random_error_ul"].get<double>(),
             microlitres_near(0.1048020, ul(0.0000005)));

  // An 8-channel 20-200 uL pipette tested at 100 uL on two channels only: evaluated, but it cannot pass.
  REQUIRE(run_plumb({"--db", db, "pipette", "add", "M-8", "--nominal", "200uL", "--range", "20uL-200uL",
                     "--channels", "8", "--every", "6mo"},
                    dir.path())
              .status == 0);
  dir.write("m.csv", "volume,channel,reading\n" + weighings("100", 1, ten) + weighings("100", 2, ten));
  r = run_plumb({"--db",        db,           "check",         "record",       "M-8",   "--procedure",
                 "gravimetric", "--balance",  "SM-02",         "--water-temp", "20C",   "--pressure",
                 "1013hPa",     "--humidity", "50%",           "--readings",   "m.csv", "--on",
                 "2026-12-01",  "--as",       "A. Technician", "--format",     "json",  "--gate"},
                dir.path());
  CHECK(r.status == 1);  // --gate on a failed check
  j = json::parse(r.out);
  CHECK(j["verdict"] == "fail");
  CHECK(j["complete"] == false);
  // ISO 8655-2 at nominal 200 uL (1.6 uL, 0.6 uL), doubled for a multichannel pipette: 3.2 uL and 1.2 uL.
  CHECK_THAT(j["volumes"][0]["channels"][1]["limits"]["systematic_ul"].get<double>(), microlitres_near(3.2, ul(1e-9)));
  CHECK_THAT(j["volumes"][0]["channels"][1]["limits"]["random_ul"].get<double>(), microlitres_near(1.2, ul(1e-9)));
  CHECK(j["volumes"][0]["channels"][1]["limits"]["doubled"] == true);
  CHECK(j["next_due"].is_null());
  std::string reasons = j["reasons"].dump();
  CHECK_THAT(reasons, Catch::Contains("3, 4, 5, 6, 7, 8") && Catch::Contains("200 uL") && Catch::Contains("20 uL"));
  r = run_plumb({"--db", db, "due", "--on", "2026-12-01", "--format", "json"}, dir.path());
  bool out_of_service = false;
  const json due_fail = json::parse(r.out);
  for (const auto& i : due_fail["items"])
    if (i["id"] == "M-8") out_of_service = i["status"] == "out of service";
  CHECK(out_of_service);
}
