// End to end: the life of instruments and runs after they are recorded: attributes that change over time,
// corrections of every procedure, and runs voided because they were entered in error.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::run_plumb;

namespace {

// Ten readings of W100 on BAL-A (d = 0.1 mg): the passing set of tests/unit/repeatability_test.cpp.
const std::string passing_readings =
    "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0002\n";

// SM-02 (d = 0.01 mg) with W100: s = 0.0091894 mg (worked in tests/cli/pipette_check_test.cpp), suitable for a
// 100 uL pipette under ISO 8655-6 Table 1.
const std::string sm02_readings =
    "reading\n100.00003\n100.00004\n100.00002\n100.00003\n100.00005\n100.00003\n100.00002\n100.00004\n100.00003\n"
    "100.00003\n";

// The ten weighings of the worked example in tests/unit/pipette_check_test.cpp (water at 20 degC).
const std::string pipette_weighings =
    "volume,channel,reading\n100uL,1,0.09971\n100uL,1,0.09965\n100uL,1,0.09980\n100uL,1,0.09958\n100uL,1,0.09992\n"
    "100uL,1,0.09975\n100uL,1,0.09969\n100uL,1,0.09983\n100uL,1,0.09961\n100uL,1,0.09977\n";

json json_of(const std::vector<std::string>& args, const plumb::test::ScratchDir& dir) {
  const auto r = run_plumb(args, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  return json::parse(r.out);
}

void ok(const std::vector<std::string>& args, const plumb::test::ScratchDir& dir) {
  const auto r = run_plumb(args, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
}

}  // namespace

TEST_CASE("instrument attributes change by dated versions and certificates state them as on the check date",
          "[cli][lifecycle]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("r.csv", passing_readings);
  ok({"--db",          db,        "balance",        "add",        "BAL-B",          "--capacity", "220g",
      "--readability", "0.1mg",   "--every",        "7d",         "--smallest-net", "200mg",      "--location",
      "Room 3",        "--maker", "Fennick Scales", "--model",    "FX 220",         "--serial",   "FX-0091",
      "--asset-tag",   "QA-0417", "--since",        "2026-01-05", "--as",           "Q. Manager"},
     dir);
  json page = json_of({"--db", db, "balance", "show", "BAL-B", "--format", "json"}, dir);
  CHECK(page["identity"]["maker"] == "Fennick Scales");
  CHECK(page["identity"]["serial"] == "FX-0091");
  CHECK(page["identity"]["asset_tag"] == "QA-0417");
  CHECK(page["location"] == "Room 3");

  ok({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on", "2026-11-30", "--as",
      "A. Technician"},
     dir);
  // A change may not be dated on or before the last check: that check's records state the attributes then.
  auto r = run_plumb({"--db", db, "instrument", "update", "BAL-A", "--location", "Room 5", "--from", "2026-11-30",
                      "--reason", "moved", "--as", "Q. Manager"},
                     dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("last check of BAL-A (2026-11-30)"));
  r = run_plumb({"--db", db, "instrument", "update", "BAL-A", "--location", "Room 2", "--reason", "no move", "--as",
                 "Q. Manager"},
                dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("nothing to change"));
  r = run_plumb({"--db", db, "instrument", "update", "BAL-A", "--location", "Room 5", "--as", "Q. Manager"},
                dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("--reason"));

  ok({"--db", db, "instrument", "update", "BAL-A", "--location", "Room 5", "--serial", "SN-77", "--from", "2026-12-01",
      "--reason", "moved to the new weighing room", "--as", "Q. Manager"},
     dir);
  page = json_of({"--db", db, "balance", "show", "BAL-A", "--format", "json"}, dir);
  CHECK(page["location"] == "Room 5");
  CHECK(page["identity"]["serial"] == "SN-77");
  REQUIRE(page["attribute_history"].size() == 2);
  CHECK(page["attribute_history"][0]["location"] == "Room 2");
  CHECK(page["attribute_history"][1]["from"] == "2026-12-01");
  CHECK(page["attribute_history"][1]["reason"] == "moved to the new weighing room");
  CHECK(page["attribute_history"][1]["recorded_by"] == "Q. Manager");
  CHECK_THAT(page["attribute_history"][1]["change"].get<std::string>(),
             Catch::Contains("location Room 2 -> Room 5") && Catch::Contains("serial - -> SN-77"));
  REQUIRE(page["runs"].size() == 1);
  CHECK(page["runs"][0]["standing"] == "current");

  // The certificate of the 2026-11-30 check, issued after the move, states Room 2 and no serial number.
  const json before = json_of({"--db", db, "certificate", "issue", "1", "--format", "json", "--as", "Q. Manager"}, dir);
  CHECK(before["instrument"]["location"] == "Room 2");
  CHECK(before["instrument"]["serial"] == "");
  // A check on 2026-12-02 is certified with the attributes from 2026-12-01.
  ok({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on", "2026-12-02", "--as",
      "A. Technician"},
     dir);
  const json after = json_of({"--db", db, "certificate", "issue", "2", "--format", "json", "--as", "Q. Manager"}, dir);
  CHECK(after["instrument"]["location"] == "Room 5");
  CHECK(after["instrument"]["serial"] == "SN-77");
  r = run_plumb({"--db", db, "certificate", "show", "2"}, dir.path());
  CHECK_THAT(r.out, Catch::Matches("[\\s\\S]*Serial number +SN-77\n[\\s\\S]*"));

  // A policy change from a date judges the checks of that date by it: BAL-A under the lab's s <= 0.05 mg fails the
  // passing readings (s = 0.0949 mg, worked in tests/unit/repeatability_test.cpp).
  ok({"--db", db, "instrument", "update", "BAL-A", "--policy", "lab", "--max-sd", "0.05mg", "--max-bias", "0.5mg",
      "--from", "2026-12-03", "--reason", "tighter limit for the assay", "--as", "Q. Manager"},
     dir);
  r = run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on",
                 "2026-12-03", "--as", "A. Technician", "--format", "json"},
                dir.path());
  REQUIRE(r.status == 0);
  const json tight = json::parse(r.out);
  CHECK(tight["verdict"] == "fail");
  CHECK(tight["policy"] == "lab");

  // Balance fields on a pipette are refused, naming them.
  ok({"--db", db, "pipette", "add", "P-07", "--nominal", "100uL", "--range", "fixed", "--every", "3mo", "--since",
      "2026-06-01", "--as", "Q. Manager"},
     dir);
  r = run_plumb(
      {"--db", db, "instrument", "update", "P-07", "--max-sd", "0.1mg", "--reason", "x", "--as", "Q. Manager"},
      dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("P-07 is a pipette"));
}

TEST_CASE("a calibration and a pipette run are corrected with new run conditions", "[cli][lifecycle]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("sm02.csv", sm02_readings);
  dir.write("w.csv", pipette_weighings);
  ok({"--db", db, "balance", "add", "SM-02", "--capacity", "120g", "--readability", "0.01mg", "--every", "7d",
      "--smallest-net", "50mg", "--since", "2026-01-05", "--as", "Q. Manager"},
     dir);
  ok({"--db", db, "check", "record", "SM-02", "--weight", "W100", "--readings", "sm02.csv", "--on", "2026-11-30",
      "--as", "A. Technician"},
     dir);
  ok({"--db", db, "pipette", "add", "P-07", "--nominal", "100uL", "--range", "fixed", "--every", "3mo", "--since",
      "2026-06-01", "--as", "Q. Manager"},
     dir);
  ok({"--db",      db,           "check",        "record", "P-07",       "--procedure", "gravimetric",
      "--balance", "SM-02",      "--water-temp", "20C",    "--pressure", "1013hPa",     "--humidity",
      "50%",       "--readings", "w.csv",        "--on",   "2026-11-30", "--as",        "A. Technician"},
     dir);
  ok({"--db", db, "certificate", "issue", "LAST", "--as", "Q. Manager"}, dir);

  // A condition of another procedure is refused, naming the ones this run takes.
  auto r = run_plumb(
      {"--db", db, "check", "correct", "2", "--temperature", "21C", "--reason", "x", "--as", "Q. Manager"}, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("--temperature does not apply to run 2, a gravimetric run") &&
                        Catch::Contains("--water-temp"));

  // The water was at 21 degC, not 20. Tanaka et al. (2001), the formula in shared/reference-data/README.md, by
  // hand at t = 21: (t + a1)^2 = 17.016965^2 = 289.57710; t + a2 = 322.797; a3 (t + a4) = 522528.9 x 90.34881
  // = 47209594.3; ratio = 289.57710 x 322.797 / 47209594.3 = 0.00197998; rho_w = 999.97495 x (1 - 0.00197998)
  // = 997.99502 kg/m3 (20 degC gave 998.20675).
  const json c = json_of({"--db", db, "check", "correct", "2", "--water-temp", "21C", "--reason",
                          "water thermometer read 1 degC low", "--as", "Q. Manager", "--format", "json"},
                         dir);
  CHECK(c["original"]["run_id"] == 2);
  CHECK(c["correction"]["supersedes"] == 2);
  CHECK(c["correction"]["environment"]["water_temperature_c"].get<double>() == Approx(21.0).margin(1e-12).epsilon(0));
  CHECK(c["correction"]["z"]["water_density_kg_m3"].get<double>() == Approx(997.99502).margin(0.000005).epsilon(0));
  CHECK(c["correction"]["readings"].size() == 10);
  CHECK(c["correction"]["readings"][4]["text"] == "0.09992");
  CHECK(c["superseded_certificate"].is_string());
  CHECK(c["new_certificate"].is_string());
  // The same conditions again change nothing.
  r = run_plumb({"--db", db, "check", "correct", "3", "--water-temp", "21C", "--reason", "again", "--as", "Q. Manager"},
                dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("changes nothing"));
}

TEST_CASE("a calibration run is corrected with a new air temperature", "[cli][lifecycle][calibration]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::calibration_lab(dir).string();
  dir.write("cal.csv", plumb::test::calibration_run_file());
  ok({"--db",           db,           "check",      "record",        "BAL-C",        "--procedure",
      "calibration",    "--readings", "cal.csv",    "--temperature", "20C",          "--pressure",
      "1013.25hPa",     "--humidity", "50%",        "--air-formula", "oiml-r111",    "--model",
      "through-origin", "--on",       "2026-11-30", "--as",          "A. Technician"},
     dir);
  // OIML R 111-1:2004 Annex E (E.3-1) by hand at t = 22 degC, p = 1013.25 hPa, h = 50 %: 0.34848 x 1013.25 =
  // 353.09736; 0.45 x exp(0.061 x 22) = 0.45 x exp(1.342) = 1.722010; (353.09736 - 1.722010) / 295.15 =
  // 1.190498 kg/m3 (at 20 degC: 1.199294).
  const json c = json_of({"--db", db, "check", "correct", "1", "--temperature", "22C", "--reason",
                          "temperature transcribed as 20 for 22", "--as", "Q. Manager", "--format", "json"},
                         dir);
  CHECK(c["correction"]["supersedes"] == 1);
  CHECK(c["correction"]["environment"]["air_density_kg_m3"].get<double>() == Approx(1.190498).epsilon(2e-6));
  // What was not corrected is taken from the original: the fitted model, the air formula, the readings.
  CHECK(c["original"]["model"] == "through-origin");
  CHECK(c["correction"]["model"] == "through-origin");
  CHECK(c["correction"]["readings"].size() == c["original"]["readings"].size());
  const json shown = json_of({"--db", db, "check", "show", "1", "--format", "json"}, dir);
  CHECK(shown["superseded_by"] == 2);
}

TEST_CASE("a run entered in error is voided: kept, marked, left out, its certificate withdrawn", "[cli][lifecycle]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("r.csv", passing_readings);
  ok({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on", "2026-11-23", "--as",
      "A. Technician"},
     dir);
  ok({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on", "2026-11-30", "--as",
      "A. Technician"},
     dir);
  ok({"--db", db, "certificate", "issue", "2", "--as", "Q. Manager"}, dir);
  json due = json_of({"--db", db, "due", "--all", "--on", "2026-12-01", "--format", "json"}, dir);
  REQUIRE(due["items"][0]["id"] == "BAL-A");
  CHECK(due["items"][0]["due_on"] == "2026-12-07");

  auto r = run_plumb({"--db", db, "check", "correct", "2", "--reason", "entered in error", "--as", "Q. Manager"},
                     dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("plumb check void"));
  r = run_plumb({"--db", db, "check", "void", "2", "--as", "Q. Manager"}, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("--reason"));

  const json v = json_of({"--db", db, "check", "void", "2", "--reason", "recorded twice; the check was on 11-23",
                          "--as", "Q. Manager", "--format", "json"},
                         dir);
  CHECK(v["run"]["status"] == "void");
  CHECK(v["run"]["void"]["reason"] == "recorded twice; the check was on 11-23");
  CHECK(v["withdrawn_certificate"].is_string());

  // The due date falls back to the run of 2026-11-23.
  due = json_of({"--db", db, "due", "--all", "--on", "2026-12-01", "--format", "json"}, dir);
  CHECK(due["items"][0]["due_on"] == "2026-11-30");
  CHECK(due["items"][0]["status"] == "overdue");
  const json summary = json_of({"--db", db, "summary", "--on", "2026-12-01", "--format", "json"}, dir);
  CHECK(summary["instruments"][0]["status"] == "overdue");
  CHECK(summary["instruments"][0]["latest"]["run_id"] == 1);
  // History keeps it, marked; trends leave it out.
  r = run_plumb({"--db", db, "history", "BAL-A"}, dir.path());
  CHECK_THAT(r.out, Catch::Contains("VOID: recorded twice"));
  const json page = json_of({"--db", db, "balance", "show", "BAL-A", "--format", "json"}, dir);
  CHECK(page["runs"][1]["standing"] == "void: recorded twice; the check was on 11-23");
  CHECK(page["runs"][1]["certificate"]["state"] == "withdrawn");

  // The certificate says so, cannot be approved, and the run cannot be voided twice or corrected.
  r = run_plumb({"--db", db, "certificate", "show", "2"}, dir.path());
  CHECK_THAT(r.out, Catch::Contains("Status: WITHDRAWN on"));
  r = run_plumb({"--db", db, "certificate", "approve", "2", "--meaning", "reviewed", "--as", "Q. Manager"}, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("withdrawn"));
  r = run_plumb({"--db", db, "check", "void", "2", "--reason", "again", "--as", "Q. Manager"}, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("void already"));
  r = run_plumb({"--db", db, "check", "correct", "2", "--on", "2026-11-29", "--reason", "x", "--as", "Q. Manager"},
                dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("is void"));
  // The trail still verifies: voiding appends, it edits nothing.
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);
}
