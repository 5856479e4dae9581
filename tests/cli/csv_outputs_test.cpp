// Every `--format csv` output read back with a real CSV parser (Python's csv module, RFC 4180 rules): each
// record has as many fields as the header, text with commas, quotes and line breaks comes back exactly, and a
// text field that a spreadsheet would run as a formula comes back with the apostrophe that disarms it.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include "support/csv_output.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::column;
using plumb::test::csv_of;
using plumb::test::run_plumb;
using plumb::test::ScratchDir;

TEST_CASE("CSV outputs keep awkward text whole and disarm spreadsheet formulas", "[cli][csv]") {
  ScratchDir dir;
  const auto db = dir.file("lab.db").string();
  const std::string awkward_location = "Room \"B\", bench 2; near the door";  // no line break: refused as input
  const std::string formula_location = "=HYPERLINK(\"http://example.invalid\",\"x\")";
  const std::string formula_operator = "+Mira Okafor-Vance";
  const std::vector<std::vector<std::string>> setup = {
      {"--db", db, "init", "--lab", "CSV Test Lab"},
      {"--db", db, "weight", "add", "W100", "--nominal", "100g", "--class", "E2", "--correction", "0.03mg",
       "--uncertainty", "0.05mg", "--certificate", "RC-1, \"second\" series", "--calibrated", "2026-03-02", "--due",
       "2027-03-02"},
      {"--db", db, "balance", "add", "BAL-A", "--capacity", "220g", "--readability", "0.1mg", "--every", "7d",
       "--smallest-net", "200mg", "--location", awkward_location, "--since", "2026-01-05"},
      {"--db", db, "balance", "add", "BAL-B", "--capacity", "220g", "--readability", "0.1mg", "--every", "7d",
       "--smallest-net", "200mg", "--location", formula_location, "--since", "2026-01-05"}};
  for (const auto& s : setup) REQUIRE(run_plumb(s, dir.path()).status == 0);
  // Ten readings: USP <41> asks for not less than 10 replicate weighings.
  dir.write("r.csv",
            "reading\n100.0003\n100.0001\n100.0002\n100.0002\n100.0003\n100.0001\n100.0002\n100.0004\n"
            "100.0002\n100.0003\n");
  REQUIRE(run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on",
                     "2026-11-02", "--as", formula_operator},
                    dir.path())
              .status == 0);

  SECTION("due") {
    const json rows = csv_of(dir, {"--db", db, "due", "--all", "--on", "2026-11-03", "--format", "csv"});
    const auto loc = column(rows, "location");
    bool awkward = false, disarmed = false;
    for (const auto& r : rows) {
      awkward = awkward || r[loc] == awkward_location;
      disarmed = disarmed || r[loc] == "'" + formula_location;
    }
    CHECK(awkward);
    CHECK(disarmed);
  }
  SECTION("summary") {
    const json rows = csv_of(dir, {"--db", db, "summary", "--on", "2026-11-03", "--format", "csv"});
    REQUIRE(rows.size() == 3);
    CHECK(rows[1][column(rows, "location")] == awkward_location);
    CHECK(rows[2][column(rows, "location")] == "'" + formula_location);
    // By hand: the ten readings sum to 1000.0023 g, mean 100.00023 g; minus the conventional mass 100.00003 g.
    CHECK(rows[1][column(rows, "bias_g")] == "0.0002");
  }
  SECTION("history") {
    const json rows = csv_of(dir, {"--db", db, "history", "BAL-A", "--format", "csv"});
    REQUIRE(rows.size() == 2);
    CHECK(rows[1][column(rows, "operator")] == "'" + formula_operator);
  }
  SECTION("audit log") {
    const json rows = csv_of(dir, {"--db", db, "audit", "log", "--format", "csv"});
    // header, the lab, the weight and its certificate, two instruments and their balance rows, the run; besides
    // them the accounts the test helper logs in with (the administrator, the member and the operator), by table
    const auto table = column(rows, "table");
    std::size_t accounts = 0;
    for (const auto& r : rows)
      for (const char* t : {"users", "passwords", "account_events", "security_settings", "sessions", "session_ends"})
        if (r[table] == t) ++accounts;
    CHECK(accounts >= 6);
    CHECK(rows.size() == 9 + accounts);
    CHECK(rows.back()[column(rows, "actor")] == "'" + formula_operator);
  }
  SECTION("weight list") {
    const json rows = csv_of(dir, {"--db", db, "weight", "list", "--format", "csv"});
    REQUIRE(rows.size() == 2);
    CHECK(rows[1][column(rows, "certificate")] == "RC-1, \"second\" series");
    CHECK(rows[1][column(rows, "conventional_mass_g")] == "100.00003");
  }
  SECTION("balance list") {
    const json rows = csv_of(dir, {"--db", db, "balance", "list", "--format", "csv"});
    REQUIRE(rows.size() == 3);
    CHECK(rows[1][column(rows, "location")] == awkward_location);
  }
}

TEST_CASE("every CSV output of the demo lab reads back with the header's field count", "[cli][csv]") {
  ScratchDir dir;
  REQUIRE(run_plumb({"demo"}, dir.path()).status == 0);
  const std::string db = dir.file("plumb-demo.db").string();
  csv_of(dir, {"--db", db, "due", "--all", "--on", "2026-12-01", "--format", "csv"});
  csv_of(dir, {"--db", db, "summary", "--on", "2026-12-01", "--format", "csv"});
  csv_of(dir, {"--db", db, "audit", "log", "--format", "csv"});
  csv_of(dir, {"--db", db, "weight", "list", "--format", "csv"});
  csv_of(dir, {"--db", db, "balance", "list", "--format", "csv"});
  for (const char* id : {"AB-01", "SM-02", "TL-03", "PF-500", "PV-1000", "PM8-200"})
    csv_of(dir, {"--db", db, "history", id, "--format", "csv"});
}
