// End to end: the edition of ISO 8655 a pipette is checked to (`pipette set-edition`). 2022 needs the lab's own
// limits (plumb does not hold the 2022 tables: refused for a pipette judged by the 2002 table) and 10 replicates at
// each test volume; a run short of them is refused, exit 2, the database unchanged; a conforming run's certificate
// names the edition. The 2022
// requirements are as recalled from memory of ISO 8655-6:2022 (checks/pipette_edition.hpp).
#include <catch2/catch.hpp>

#include <cctype>

#include <nlohmann/json.hpp>

#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::run_plumb;

namespace {

// The SM-02 balance and its weekly check of tests/cli/pipette_check_test.cpp.
std::string edition_lab(const plumb::test::ScratchDir& dir) {
  const auto db = plumb::test::pipette_balance_lab(dir).string();
  for (const std::vector<std::string>& step :
       {std::vector<std::string>{"--db", db, "pipette", "add", "P-07", "--nominal", "100uL", "--range", "fixed",
                                 "--every", "3mo", "--since", "2026-06-01"},
        std::vector<std::string>{"--db", db, "pipette", "add", "P-08", "--nominal", "100uL", "--range", "fixed",
                                 "--every", "3mo", "--max-systematic", "0.8uL", "--max-random", "0.3uL", "--since",
                                 "2026-06-01"}}) {
    const auto r = run_plumb(step, dir.path());
    INFO(r.err);
    REQUIRE(r.status == 0);
  }
  return db;
}

std::string weighings(int n) {
  const std::vector<std::string> ten = {"0.09971", "0.09965", "0.09980", "0.09958", "0.09992",
                                        "0.09975", "0.09969", "0.09983", "0.09961", "0.09977"};
  std::string csv = "volume,channel,reading\n";
  for (int i = 0; i < n; ++i) csv += "100uL,1," + ten[static_cast<std::size_t>(i)] + "\n";
  return csv;
}

// Text renderings wrap long values at spaces; what they say is compared without whitespace.
std::string squeezed(const std::string& s) {
  std::string out;
  for (char c : s)
    if (!std::isspace(static_cast<unsigned char>(c))) out += c;
  return out;
}

plumb::test::RunResult record(const std::string& db, const std::string& pipette, const plumb::test::ScratchDir& dir) {
  return run_plumb({"--db",      db,           "check",        "record", pipette,      "--procedure", "gravimetric",
                    "--balance", "SM-02",      "--water-temp", "20C",    "--pressure", "1013hPa",     "--humidity",
                    "50%",       "--readings", "w.csv",        "--on",   "2026-12-01", "--as",        "A. Technician"},
                   dir.path());
}

}  // namespace

TEST_CASE("ISO 8655:2022 chosen per pipette: refused runs, the certificate names the edition",
          "[cli][pipette][edition]") {
  plumb::test::ScratchDir dir;
  const auto db = edition_lab(dir);
  // P-07 is judged by the 2002 Table 1: 2022 is refused for it (plumb holds no 2022 table), nothing written.
  const auto before = plumb::test::dump_database(db);
  auto r = run_plumb({"--db", db, "pipette", "set-edition", "P-07", "--edition", "2022"}, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(squeezed(r.err), Catch::Contains("ISO8655-2:2002Table1") && Catch::Contains("--max-systematic"));
  CHECK(plumb::test::dump_database(db) == before);
  r = run_plumb(
      {"--db", db, "pipette", "set-edition", "P-08", "--edition", "2022", "--reason", "moving to the 2022 editions"},
      dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("ISO 8655:2022"));
  const auto after_edition = plumb::test::dump_database(db);
  // P-08 has the lab's limits, but 9 replicates are one short of 2022's 10.
  dir.write("w.csv", weighings(9));
  r = record(db, "P-08", dir);
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("9 replicate(s)") && Catch::Contains("needs 10"));
  CHECK(plumb::test::dump_database(db) == after_edition);
  // Ten: recorded, and the certificate states the edition in every rendering.
  dir.write("w.csv", weighings(10));
  r = record(db, "P-08", dir);
  INFO(r.err);
  REQUIRE(r.status == 0);
  r = run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path());
  CHECK(json::parse(r.out)["edition"]["edition"] == "2022");
  r = run_plumb({"--db", db, "certificate", "issue", "LAST"}, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(squeezed(r.out), Catch::Contains("ISO8655-6:2022") && Catch::Contains("ISO8655-2:2022"));
  r = run_plumb({"--db", db, "certificate", "show", "LAST", "--format", "html"}, dir.path());
  CHECK_THAT(squeezed(r.out), Catch::Contains("ISO8655-6:2022"));
}

TEST_CASE("the lab's default edition of ISO 8655: followed by pipettes without their own, recorded and audited",
          "[cli][pipette][edition]") {
  plumb::test::ScratchDir dir;
  const auto db = edition_lab(dir);
  // P-07 is judged by the 2002 Table 1 and has no edition of its own: a 2022 default would leave it unable to record
  // a run, so it is refused, naming it, and nothing is written.
  const std::vector<std::string> to_2022 = {"--db",      db,     "pipette", "default-edition",
                                            "--edition", "2022", "--as",    "Q. Manager"};
  plumb::test::prepare_login(to_2022, dir.path());  // the quality manager's account first
  const auto before = plumb::test::dump_database(db);
  auto r = run_plumb(to_2022, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(squeezed(r.err), Catch::Contains("pipetteP-07(and0other(s))wouldfollowthelab'sdefault") &&
                                  Catch::Contains("pipetteset-editionP-07--edition2002"));
  CHECK(plumb::test::dump_database(db) == before);
  // P-07 keeps 2002 of its own; then the default can be 2022, which P-08 (the lab's limits, no edition of its own)
  // follows.
  REQUIRE(
      run_plumb({"--db", db, "pipette", "set-edition", "P-07", "--edition", "2002", "--as", "Q. Manager"}, dir.path())
          .status == 0);
  r = run_plumb({"--db", db, "pipette", "default-edition", "--edition", "2022", "--reason",
                 "the lab moves to the 2022 editions", "--as", "Q. Manager"},
                dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("checked to ISO 8655:2022 from now on"));
  // P-08 now needs ISO 8655-6:2022's 10 replicates (checks/pipette_edition, recalled from memory): 4 are refused.
  dir.write("w.csv", weighings(4));
  const auto before_run = plumb::test::dump_database(db);
  r = record(db, "P-08", dir);
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("ISO 8655-6:2022 needs 10") && Catch::Contains("checked to ISO 8655:2022"));
  CHECK(plumb::test::dump_database(db) == before_run);
  // P-07 keeps its own 2002: 4 replicates are enough there.
  r = record(db, "P-07", dir);
  INFO(r.err);
  CHECK(r.status == 0);
  dir.write("w.csv", weighings(10));
  r = record(db, "P-08", dir);
  INFO(r.err);
  REQUIRE(r.status == 0);
  const json j = json::parse(run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path()).out);
  CHECK(j["edition"]["edition"] == "2022");
  // The choice is in the audit trail, with its reason, and the trail verifies.
  r = run_plumb({"--db", db, "audit", "log", "--format", "json"}, dir.path());
  CHECK_THAT(r.out, Catch::Contains("lab_pipette_editions") && Catch::Contains("the lab moves to the 2022 editions"));
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);
}
