// End to end: importing a history file through the built binary, then the lab summary and due list on it.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include "support/audit_chain.hpp"
#include "support/margin.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::grams_near;
using plumb::test::run_plumb;
using plumb::test::ug;

namespace {

const std::vector<std::string> passing = {"100.0003", "100.0001", "100.0002", "100.0004", "100.0002",
                                          "100.0003", "100.0001", "100.0002", "100.0003", "100.0002"};

std::string row(const std::string& date, const std::string& reading) {
  return "BAL-A,repeatability," + date + ",A. Technician,W100," + reading + ",g\n";
}

// Two passing runs of BAL-A (the readings of the weekly check, s = 0.0000949 g), then a failing one:
// readings alternating 100.0001 / 100.0023 g have s = 0.0011 * sqrt(10/9) = 0.0011595018 g, above the USP <41>
// limit for its 200 mg smallest net weight (2 s / m <= 0.10 % gives s <= 0.0001 g).
std::string history() {
  std::string csv = "instrument,procedure,date,operator,weight,reading,unit\n";
  for (const char* date : {"2026-04-06", "2026-04-13"})
    for (const auto& r : passing) csv += row(date, r);
  for (int i = 0; i < 10; ++i) csv += row("2026-04-20", i % 2 ? "100.0023" : "100.0001");
  return csv;
}

}  // namespace

TEST_CASE("history import records validated runs once and reports them", "[cli][import]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("history.csv", history());

  auto r =
      run_plumb({"--db", db, "check", "import", "history.csv", "--as", "Q. Manager", "--format", "json"}, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK(r.err.empty());  // no progress bar when stderr is not a terminal
  const json rep = json::parse(r.out);
  CHECK(rep["runs"] == 3);
  CHECK(rep["readings"] == 30);
  CHECK(rep["first_run_id"] == 1);
  CHECK(rep["last_run_id"] == 3);
  CHECK(rep["instruments"]["BAL-A"]["runs"] == 3);
  CHECK(rep["instruments"]["BAL-A"]["failed"] == 1);
  CHECK(rep["instruments"]["BAL-A"]["first_date"] == "2026-04-06");
  CHECK(rep["instruments"]["BAL-A"]["last_date"] == "2026-04-20");
  REQUIRE(rep["failures"].size() == 1);
  CHECK(rep["failures"][0]["run_id"] == 3);
  CHECK(rep["failures"][0]["line"] == 22);

  // The imported run is computed exactly as a typed one: values worked by hand in repeatability_test.cpp
  // (s = sqrt(0.9) x 0.1 mg = 0.0948683298 mg, bias 0.2 mg).
  r = run_plumb({"--db", db, "check", "show", "1", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json run = json::parse(r.out);
  CHECK(run["operator"] == "A. Technician");
  CHECK_THAT(run["sd_g"].get<double>(), grams_near(0.0000948683298, ug(0.00005)));
  CHECK_THAT(run["bias_g"].get<double>(), grams_near(0.0002, ug(1e-7)));
  CHECK(run["next_due"] == "2026-04-13");
  r = run_plumb({"--db", db, "check", "show", "3", "--format", "json"}, dir.path());
  CHECK(json::parse(r.out)["verdict"] == "fail");
  CHECK_THAT(json::parse(r.out)["sd_g"].get<double>(), grams_near(0.0011595018087, ug(0.0001)));

  // The same file again is refused, and nothing changes.
  const std::vector<std::string> again = {"--db", db, "check", "import", "history.csv", "--as", "Q. Manager"};
  plumb::test::prepare_login(again, dir.path());  // the member's account first: the comparison is of the import
  const std::string before = plumb::test::dump_database(db);
  r = run_plumb(again, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("already imported as batch 1"));
  CHECK(plumb::test::dump_database(db) == before);

  const auto audit = plumb::test::check_audit_chain(db);
  CHECK(audit.problem.empty());
  // lab, weight, its certificate, instrument, balance; one record per run (run + weight + 10 readings); the batch;
  // and the accounts the test helper logged in with.
  CHECK(audit.rows == 5 + 3 + 1 + plumb::test::account_records(db));
}

TEST_CASE("lab summary shows each instrument's latest result and agrees with the due list", "[cli][import]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  REQUIRE(run_plumb({"--db", db, "balance", "add", "BAL-B", "--capacity", "220g", "--readability", "0.1mg", "--every",
                     "30d", "--smallest-net", "200mg", "--location", "Room 3", "--since", "2026-05-01"},
                    dir.path())
              .status == 0);
  std::string csv = "instrument,procedure,date,operator,weight,reading,unit\n";
  for (const auto& r : passing) csv += row("2026-04-06", r);
  dir.write("h.csv", csv);
  REQUIRE(run_plumb({"--db", db, "check", "import", "h.csv"}, dir.path()).status == 0);

  auto r = run_plumb({"--db", db, "summary", "--on", "2026-06-01", "--format", "json"}, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const json s = json::parse(r.out);
  REQUIRE(s["instruments"].size() == 2);
  const json& a = s["instruments"][0];
  CHECK(a["id"] == "BAL-A");
  CHECK(a["latest"]["run_id"] == 1);
  CHECK(a["latest"]["verdict"] == "pass");
  CHECK_THAT(a["latest"]["sd_g"].get<double>(), grams_near(0.0000948683298, ug(0.00005)));
  CHECK(a["next_due"] == "2026-04-13");  // passed 2026-04-06, every 7 days
  CHECK(a["days_left"] == -49);
  CHECK(a["status"] == "overdue");
  const json& b = s["instruments"][1];
  CHECK(b["id"] == "BAL-B");
  CHECK(b["latest"].is_null());
  CHECK(b["next_due"] == "2026-05-01");  // never checked: due since it was registered
  CHECK(b["status"] == "overdue");

  r = run_plumb({"--db", db, "summary", "--on", "2026-06-01", "--format", "csv"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::StartsWith("id,kind,location,status,next_due,days_left,last_run"));
  CHECK_THAT(r.out, Catch::Contains("BAL-A,balance,\"Room 2\",overdue,2026-04-13,-49,1,2026-04-06,repeatability,pass"));

  r = run_plumb({"--db", db, "due", "--on", "2026-06-01", "--format", "csv"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out,
             Catch::Contains("balance,BAL-A,overdue,2026-04-13,-49,\"Room 2\",\"last passed 2026-04-06 (run 1)\""));
  CHECK_THAT(r.out, Catch::Contains("balance,BAL-B,overdue,2026-05-01,-31,\"Room 3\",\"no check recorded yet\""));
}
