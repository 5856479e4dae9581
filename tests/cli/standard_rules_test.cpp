// Rules of the standards as a lab meets them through the built binary: the minimum of replicate weighings
// (USP <41> or the lab's own, stated on the certificate) and capacity judged on the load, not on the reading.
// The refusals (too few readings, a negative reading, a load above capacity) are tests/malformed cases.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include "support/margin.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::grams_near;
using plumb::test::run_plumb;
using plumb::test::ug;

namespace {

/// The text with every run of spaces and line breaks as one space: a certificate wraps its lines at 78.
std::string squeezed(const std::string& text) {
  std::string out;
  for (char c : text) {
    const bool space = c == ' ' || c == '\n';
    if (space && (out.empty() || out.back() == ' ')) continue;
    out += space ? ' ' : c;
  }
  return out;
}

void must(const plumb::test::RunResult& r) {
  INFO("stderr: " << r.err);
  REQUIRE(r.status == 0);
}

}  // namespace

TEST_CASE("USP <41>: ten replicate weighings recorded, and the certificate says which minimum applied",
          "[cli][min-readings]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("r.csv",
            "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n"
            "100.0003\n100.0002\n");
  must(run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on",
                  "2026-11-30", "--as", "A. Technician"},
                 dir.path()));
  auto r = run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path());
  must(r);
  const json run = json::parse(r.out);
  CHECK(run["n"] == 10);
  CHECK(run["required_readings"] == 10);
  CHECK_THAT(run["readings_basis"].get<std::string>(), Catch::Contains("USP General Chapter <41> Balances"));

  r = run_plumb({"--db", db, "certificate", "issue", "LAST", "--as", "Q. Manager"}, dir.path());
  must(r);
  CHECK_THAT(squeezed(r.out), Catch::Contains("Minimum number of readings 10: USP General Chapter <41> Balances "
                                              "(2013 onwards) asks for not less than 10 replicate weighings"));
  CHECK_THAT(r.out, !Catch::Contains("from memory"));
}

TEST_CASE("a lab policy of 3 replicate weighings: accepted, noted, and stated on the certificate",
          "[cli][min-readings]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  must(run_plumb(
      {"--db", db, "instrument", "update", "BAL-A", "--max-bias", "0.5mg", "--min-readings", "3", "--from",
       "2026-11-02", "--reason", "lab SOP LQ-7: triplicate weighings for the daily check", "--as", "Q. Manager"},
      dir.path()));
  // 100.0002, 100.0004, 100.0003 by hand: mean 100.0003 g, bias against 100.00003 g = +0.27 mg <= 0.5 mg.
  dir.write("three.csv", "reading\n100.0002\n100.0004\n100.0003\n");
  auto r = run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "three.csv", "--on",
                      "2026-11-30", "--as", "A. Technician", "--format", "json"},
                     dir.path());
  must(r);
  const json run = json::parse(r.out);
  CHECK(run["verdict"] == "pass");
  CHECK(run["required_readings"] == 3);
  CHECK_THAT(run["bias_g"].get<double>(), grams_near(0.00027, ug(0.001)));
  REQUIRE(run["notes"].size() == 1);
  CHECK_THAT(run["notes"][0].get<std::string>(), Catch::Contains("Only 3 readings"));

  r = run_plumb({"--db", db, "certificate", "issue", "LAST", "--as", "Q. Manager"}, dir.path());
  must(r);
  CHECK_THAT(squeezed(r.out), Catch::Contains("Minimum number of readings 3: the lab's policy for this balance asks "
                                              "for at least 3 replicate weighings") &&
                                  Catch::Contains("Tolerance policy lab limits"));

  // Two readings are below that policy: refused, naming it, nothing written.
  dir.write("two.csv", "reading\n100.0002\n100.0004\n");
  const std::string before = plumb::test::dump_database(db);
  r = run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "two.csv", "--on",
                 "2026-11-30", "--as", "A. Technician"},
                dir.path());
  CHECK(r.status == 2);
  CHECK(r.err ==
        "plumb: two.csv: 2 reading(s) given; the lab's policy for this balance asks for at least 3 "
        "replicate weighings.\n");
  CHECK(plumb::test::dump_database(db) == before);
}

TEST_CASE("capacity is judged on the load: a full-capacity weight on a balance that reads high is recorded",
          "[cli][capacity]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  must(run_plumb(
      {"--db", db, "weight", "add", "W200", "--nominal", "200g", "--class", "E2", "--correction", "0.05mg",
       "--uncertainty", "0.08mg", "--certificate", "RC-200", "--calibrated", "2026-03-02", "--due", "2027-03-02"},
      dir.path()));
  must(run_plumb({"--db", db, "balance", "add", "BAL-F", "--capacity", "200g", "--readability", "0.1mg", "--every",
                  "7d", "--smallest-net", "200mg", "--since", "2026-01-05"},
                 dir.path()));
  // Every reading is above Max = 200 g. The worked example's digits (tests/unit/repeatability_test.cpp) shifted
  // by +10 mg: mean 200.01023 g, s = 0.0948683 mg; bias = 200.01023 - 200.00005 = +10.18 mg, within 0.10 % of
  // 200.00005 g = 200.00005 mg (USP <41>); m_min = 189.737 mg <= 200 mg. By hand.
  dir.write("high.csv",
            "reading\n200.0103\n200.0101\n200.0102\n200.0104\n200.0102\n200.0103\n200.0101\n200.0102\n"
            "200.0103\n200.0102\n");
  auto r = run_plumb({"--db", db, "check", "record", "BAL-F", "--weight", "W200", "--readings", "high.csv", "--on",
                      "2026-11-30", "--as", "A. Technician", "--format", "json"},
                     dir.path());
  must(r);
  const json run = json::parse(r.out);
  CHECK(run["verdict"] == "pass");
  CHECK_THAT(run["bias_g"].get<double>(), grams_near(0.01018, ug(0.001)));
  // A 200 g weight is 100 % of a 200 g capacity, inside USP <41>'s 5 % to 100 %: no note (its conventional mass,
  // 200.00005 g, is not the load's share of capacity).
  CHECK(run["notes"].empty());
}

TEST_CASE("capacity is judged on the load in a calibration: 220 g on a 220 g balance reading 220.0012 g",
          "[cli][capacity][calibration]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::calibration_lab(dir).string();
  std::string csv = "stage,part,load,position,direction,reading,unit\n";
  for (int i = 0; i < 10; ++i)
    csv += std::string("as-found,repeatability,W100,,,") + (i % 2 ? "100.0004" : "100.0003") + ",g\n";
  csv +=
      "as-found,eccentricity,W100,centre,,100.0003,g\n"
      "as-found,eccentricity,W100,front-left,,100.0005,g\n"
      "as-found,eccentricity,W100,front-right,,100.0002,g\n"
      "as-found,eccentricity,W100,back-left,,100.0003,g\n"
      "as-found,eccentricity,W100,back-right,,100.0004,g\n"
      "as-found,indication,W20,,up,20.0001,g\n"
      "as-found,indication,W50,,up,50.0002,g\n"
      "as-found,indication,W100,,up,100.0004,g\n"
      "as-found,indication,W200,,up,200.0008,g\n"
      "as-found,indication,W200+W20,,up,220.0012,g\n";
  dir.write("cal.csv", csv);
  auto r = run_plumb({"--db", db, "check", "record", "BAL-C", "--procedure", "calibration", "--readings", "cal.csv",
                      "--on", "2026-11-30", "--as", "A. Technician", "--format", "json"},
                     dir.path());
  must(r);
  const json j = json::parse(r.out);
  const json& loads = j["as_found"]["loads"];
  REQUIRE(loads.size() == 5);
  // Zero corrections, 8000 kg/m3 weights: E = I - nominal = 220.0012 - 220 = +1.2 mg exactly. OIML R 76-1:2006
  // Table 6 (from memory, cross-checked in tests/reference): class I, 220 000 e > 200 000 e: 1.5 e on initial
  // verification, 3 e = 3 mg in service, so the load passes.
  CHECK(loads[4]["error_exact_g"] == "0.0012");
  CHECK_THAT(loads[4]["tolerance_g"].get<double>(), grams_near(0.003, ug(0.001)));
  CHECK(loads[4]["state"] == "pass");
}
