// End to end: the weekly check exactly as a technician runs it, through the built binary.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include "support/margin.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::grams_near;
using plumb::test::mg;
using plumb::test::percent_near;
using plumb::test::pp;
using plumb::test::run_plumb;
using plumb::test::ug;
using plumb::test::within_fraction_of_d;

namespace {

const std::string passing_readings =
    "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0002\n";

}  // namespace

TEST_CASE("weekly check: record, show, certify, due", "[cli]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("readings.csv", passing_readings);

  auto r = run_plumb({"--db", db, "check", "record", "BAL-A", "--procedure", "repeatability", "--weight", "W100",
                      "--readings", "readings.csv", "--on", "2026-11-30", "--as", "A. Technician"},
                     dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("PASS"));

  r = run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json j = json::parse(r.out);
  // Values worked by hand in tests/unit/repeatability_test.cpp for the same readings: mean 100.00023 g,
  // s = sqrt(0.9) x 0.1 mg = 0.0948683298 mg, bias 0.2 mg = 0.00019999994 % of 100.00003 g, m_min = 2000 s.
  // Means and biases within d/100 or tighter (d = 0.1 mg); s and m_min to the digits worked by hand.
  CHECK(j["run_id"] == 1);
  CHECK(j["instrument"] == "BAL-A");
  CHECK(j["procedure"] == "repeatability");
  CHECK(j["date"] == "2026-11-30");
  CHECK(j["n"] == 10);
  CHECK_THAT(j["mean_g"].get<double>(), within_fraction_of_d(100.00023, mg(0.1), 100));
  CHECK_THAT(j["sd_g"].get<double>(), grams_near(0.0000948683298, ug(0.00005)));
  CHECK_THAT(j["reference_g"].get<double>(), grams_near(100.00003, ug(0.001)));
  CHECK_THAT(j["bias_g"].get<double>(), grams_near(0.0002, ug(1e-7)));
  CHECK_THAT(j["bias_pct"].get<double>(), percent_near(0.00019999994, pp(1e-13)));
  CHECK_THAT(j["readability_g"].get<double>(), grams_near(0.0001, ug(1e-6)));
  CHECK(j["sd_over_d"].get<double>() == Approx(0.948683298).margin(1e-9).epsilon(0));
  CHECK_THAT(j["min_weight_g"].get<double>(), grams_near(0.1897366596, ug(0.001)));
  CHECK(j["verdict"] == "pass");
  CHECK(j["reasons"].empty());
  CHECK(j["next_due"] == "2026-12-07");
  CHECK(j["readings"][3]["text"] == "100.0004");

  r = run_plumb({"--db", db, "certificate", "issue", "LAST", "--format", "text", "--as", "Q. Manager"}, dir.path());
  REQUIRE(r.status == 0);
  for (const char* must : {"BC-2026-0001", "Example Analytical Lab", "BAL-A", "W100", "RC-2291", "2026-11-30",
                           "A. Technician", "100.0004", "USP <41>", "VERDICT: PASS", "2026-12-07",
                           "simple acceptance", "does not replace, accredited calibration"}) {
    INFO(must);
    CHECK_THAT(r.out, Catch::Contains(must));
  }
  // Issuing again returns the stored certificate unchanged.
  const auto again = run_plumb({"--db", db, "certificate", "issue", "LAST", "--format", "json"}, dir.path());
  REQUIRE(again.status == 0);
  CHECK(json::parse(again.out)["number"] == "BC-2026-0001");
  CHECK_THAT(again.err, Catch::Contains("already has certificate"));

  r = run_plumb({"--db", db, "due", "--within", "14d", "--on", "2026-12-01", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json due = json::parse(r.out);
  REQUIRE(due["items"].size() == 1);
  CHECK(due["items"][0]["id"] == "BAL-A");
  CHECK(due["items"][0]["due_on"] == "2026-12-07");
  CHECK(due["items"][0]["days_left"] == 6);
}

TEST_CASE("a failed check puts the balance out of service until a passing check", "[cli]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  // s = 0.2108 mg -> m_min = 421.6 mg > 200 mg (worked in repeatability_test.cpp).
  dir.write("bad.csv", "reading\n100.0000\n100.0004\n100.0000\n100.0004\n100.0000\n100.0004\n100.0000\n100.0004\n"
                       "100.0000\n100.0004\n");
  dir.write("good.csv", passing_readings);
  auto r = run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "bad.csv", "--on",
                      "2026-11-23", "--as", "A. Technician", "--gate"},
                     dir.path());
  CHECK(r.status == 1);  // --gate: a failed check exits 1
  r = run_plumb({"--db", db, "due", "--on", "2026-11-24", "--format", "json"}, dir.path());
  auto due = json::parse(r.out);
  REQUIRE(due["items"].size() == 1);
  CHECK(due["items"][0]["status"] == "out of service");
  r = run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "-", "--on", "2026-11-24",
                 "--as", "A. Technician"},
                dir.path(), passing_readings);
  REQUIRE(r.status == 0);
  due = json::parse(run_plumb({"--db", db, "due", "--on", "2026-11-24", "--format", "json"}, dir.path()).out);
  REQUIRE(due["items"].size() == 1);
  CHECK(due["items"][0]["status"] == "due");
  CHECK(due["items"][0]["due_on"] == "2026-12-01");
}

TEST_CASE("due lists overdue reference weights and never-checked balances", "[cli]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto r = run_plumb({"--db", db, "due", "--on", "2027-03-10", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const auto due = json::parse(r.out);
  REQUIRE(due["items"].size() == 2);
  // BAL-A registered --since 2026-01-05 and never checked: 429 days overdue on 2027-03-10 (by hand:
  // 2026-01-05 -> 2027-01-05 is 365 days, + 26 (Jan) + 28 (Feb) + 10 = 429). W100 due 2027-03-02: 8 days over.
  CHECK(due["items"][0]["id"] == "BAL-A");
  CHECK(due["items"][0]["days_left"] == -429);
  CHECK(due["items"][1]["id"] == "W100");
  CHECK(due["items"][1]["status"] == "overdue");
  CHECK(due["items"][1]["days_left"] == -8);
}

TEST_CASE("the demo builds its own database and prints a due list and a certificate", "[cli][demo]") {
  plumb::test::ScratchDir dir;
  const auto r = run_plumb({"demo"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK(std::filesystem::exists(dir.file("plumb-demo.db")));
  CHECK_THAT(r.out, Catch::Contains("out of service") && Catch::Contains("overdue") &&
                        Catch::Contains("Balance check certificate"));
  // Run twice: the demo replaces its own database, and refuses to overwrite anything else.
  CHECK(run_plumb({"demo"}, dir.path()).status == 0);
  dir.write("other.db", "not a database of ours");
  const auto refused = run_plumb({"--db", "other.db", "demo"}, dir.path());
  CHECK(refused.status != 0);
}
