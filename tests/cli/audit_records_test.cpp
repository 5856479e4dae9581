// End to end through the built binary: corrections that keep the original, review and approval, retiring and
// reinstating, the audit log, audit verify against a tamperer using the sqlite3 shell, backup and restore.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include "support/audit_chain.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::run_plumb;

namespace {

// s = 0.2108 mg -> m_min = 421.6 mg > 200 mg: fails USP <41> (worked in repeatability_test.cpp).
const std::string failing_readings =
    "reading\n100.0000\n100.0004\n100.0000\n100.0004\n100.0000\n100.0004\n100.0000\n100.0004\n100.0000\n100.0004\n";
const std::string passing_readings =
    "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0002\n";

int sqlite3_shell(const std::string& db, const std::string& sql) {
  return std::system(("sqlite3 '" + db + "' \"" + sql + "\" >/dev/null 2>&1").c_str());
}

std::string number_of_certificate(const std::string& db, const plumb::test::ScratchDir& dir, const std::string& run) {
  const auto r = run_plumb({"--db", db, "certificate", "show", run, "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  return json::parse(r.out)["number"].get<std::string>();
}

}  // namespace

TEST_CASE("a correction supersedes the run and its certificate and keeps both visible", "[cli][audit]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("typed.csv", failing_readings);
  dir.write("fixed.csv", passing_readings);
  REQUIRE(run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "typed.csv", "--on",
                     "2026-11-30", "--as", "A. Technician"},
                    dir.path())
              .status == 0);
  REQUIRE(run_plumb({"--db", db, "certificate", "issue", "1", "--as", "Q. Manager"}, dir.path()).status == 0);
  const std::string old_number = number_of_certificate(db, dir, "1");

  auto r = run_plumb({"--db", db, "check", "correct", "1", "--readings", "fixed.csv", "--reason",
                      "readings typed from the wrong worksheet", "--as", "Q. Manager", "--format", "json"},
                     dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const json c = json::parse(r.out);
  CHECK(c["original"]["run_id"] == 1);
  CHECK(c["original"]["verdict"] == "fail");
  CHECK(c["correction"]["run_id"] == 2);
  CHECK(c["correction"]["supersedes"] == 1);
  CHECK(c["correction"]["verdict"] == "pass");            // re-evaluated: the same readings pass in weekly_check_test
  CHECK(c["correction"]["operator"] == "A. Technician");  // the operator stays; the corrector is in the trail
  CHECK(c["superseded_certificate"] == old_number);
  const std::string new_number = c["new_certificate"].get<std::string>();
  CHECK(new_number != old_number);

  // Both runs stay visible, each saying how it relates to the other.
  r = run_plumb({"--db", db, "check", "show", "1"}, dir.path());
  CHECK_THAT(r.out, Catch::Contains("SUPERSEDED by run 2"));
  r = run_plumb({"--db", db, "check", "show", "2"}, dir.path());
  CHECK_THAT(r.out, Catch::Contains("corrects run 1: readings typed from the wrong worksheet"));

  // The superseded certificate says so in text and JSON; the new one names the one it replaces.
  r = run_plumb({"--db", db, "certificate", "show", old_number}, dir.path());
  CHECK_THAT(r.out, Catch::Contains("Status: SUPERSEDED by " + new_number) && Catch::Contains("*** SUPERSEDED ***") &&
                        Catch::Contains("no longer valid") && Catch::Contains("VERDICT: FAIL"));
  r = run_plumb({"--db", db, "certificate", "show", old_number, "--format", "json"}, dir.path());
  json status = json::parse(r.out)["status"];
  CHECK(status["state"] == "superseded");
  CHECK(status["superseded"]["by_certificate"] == new_number);
  CHECK(status["superseded"]["reason"] == "readings typed from the wrong worksheet");
  r = run_plumb({"--db", db, "certificate", "show", new_number, "--format", "json"}, dir.path());
  const json fresh = json::parse(r.out);
  CHECK(fresh["status"]["state"] == "draft");
  CHECK(fresh["status"]["replaces"] == old_number);
  CHECK(fresh["replaces"]["number"] == old_number);
  CHECK(fresh["verdict"] == "pass");

  // The instrument's trail shows the original, the correction with its reason, and the certificate events.
  r = run_plumb({"--db", db, "audit", "log", "--instrument", "BAL-A", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json log = json::parse(r.out);
  std::vector<json> runs, events;
  for (const auto& rec : log["records"]) {
    if (rec["table"] == "check_runs") runs.push_back(rec);
    if (rec["table"] == "certificate_events") events.push_back(rec);
  }
  // One record per run holds the run with its weight and its readings ("insert rows").
  REQUIRE(runs.size() == 2);
  CHECK(runs[0]["action"] == "insert rows");
  CHECK(runs[0]["row_key"] == "id=1");
  CHECK(runs[0]["after"]["check_runs"][0]["id"] == 1);
  CHECK(runs[0]["after"]["run_weights"].size() == 1);
  CHECK(runs[0]["after"]["readings"].size() == 10);
  CHECK(runs[0]["actor"] == "A. Technician");
  CHECK(runs[1]["after"]["check_runs"][0]["supersedes"] == 1);
  CHECK(runs[1]["actor"] == "Q. Manager");
  CHECK(runs[1]["reason"] == "readings typed from the wrong worksheet");
  REQUIRE(events.size() == 1);
  CHECK(events[0]["after"]["event"] == "superseded");
  // Instrument and balance rows, two runs (each with its weight and readings), 2 certificates, 1 event.
  CHECK(log["records"].size() == 2 + 2 + 2 + 1);

  r = run_plumb({"--db", db, "audit", "log", "--certificate", old_number, "--format", "csv"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK(r.out.rfind("seq,at_utc,actor,user_id,user,os_user,action,table,row_key,reason", 0) == 0);
  CHECK_THAT(r.out, Catch::Contains(",certificates,id=1,") && Catch::Contains(",certificates,id=2,") &&
                        Catch::Contains(",certificate_events,") && Catch::Contains("readings typed from the wrong"));
  r = run_plumb({"--db", db, "audit", "log"}, dir.path());
  // One readable line per record: who, what and why (the OS account is in the CSV and JSON).
  CHECK_THAT(r.out,
             Catch::Contains("  Q. Manager [" + plumb::test::test_login("Q. Manager") +
                             "]  recorded check run 2 on BAL-A (repeatability, 2026-11-30, pass, supersedes run 1; 10 "
                             "readings): why \"readings typed from the wrong worksheet\"") &&
                 Catch::Contains("  A. Technician [" + plumb::test::test_login("A. Technician") +
                                 "]  recorded check run 1 on BAL-A (repeatability"));

  // The correction made the balance pass: due follows the correction, not the superseded failure.
  r = run_plumb({"--db", db, "due", "--on", "2026-12-01", "--format", "json"}, dir.path());
  const json due = json::parse(r.out);
  REQUIRE(due["items"].size() == 1);
  CHECK(due["items"][0]["status"] == "due");
  CHECK(due["items"][0]["due_on"] == "2026-12-07");

  // A superseded run cannot be corrected again, nor certified.
  r = run_plumb({"--db", db, "check", "correct", "1", "--on", "2026-11-29", "--reason", "x", "--as", "Q. Manager"},
                dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("already corrected by run 2"));
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);
}

TEST_CASE("a certificate is a draft until someone other than its operator approves it", "[cli][audit]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("r.csv", passing_readings);
  REQUIRE(run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on",
                     "2026-11-30", "--as", "A. Technician"},
                    dir.path())
              .status == 0);
  REQUIRE(run_plumb({"--db", db, "certificate", "issue", "LAST", "--as", "A. Technician"}, dir.path()).status == 0);
  const std::string number = number_of_certificate(db, dir, "1");
  auto r = run_plumb({"--db", db, "certificate", "show", number}, dir.path());
  CHECK_THAT(r.out, Catch::Contains("Status: DRAFT, not approved") && Catch::Contains("*** DRAFT ***"));

  // The operator cannot approve their own check: the account that recorded the run is refused (by user id).
  const std::string before = plumb::test::dump_database(db);
  r = run_plumb(
      {"--db", db, "certificate", "approve", number, "--as", "A. Technician", "--meaning", "reviewed and approved"},
      dir.path());
  CHECK(r.status == 4);
  CHECK(r.out.empty());
  CHECK_THAT(r.err, Catch::Contains("someone who neither recorded nor corrected its run"));
  CHECK(plumb::test::dump_database(db) == before);

  r = run_plumb({"--db", db, "certificate", "approve", number, "--as", "Q. Manager", "--meaning",
                 "reviewed and approved", "--format", "json"},
                dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const json approved = json::parse(r.out)["status"];
  CHECK(approved["state"] == "approved");
  CHECK(approved["approval"]["by"] == "Q. Manager");
  CHECK(approved["approval"]["meaning"] == "reviewed and approved");
  CHECK(approved["approval"]["at"].get<std::string>().size() == 20);  // 2026-12-02T01:02:03Z
  r = run_plumb({"--db", db, "certificate", "show", number}, dir.path());
  CHECK_THAT(r.out, Catch::Contains("Status: APPROVED by Q. Manager") &&
                        Catch::Contains("Q. Manager (reviewer and quality manager)") &&
                        Catch::Contains("\u201creviewed and approved\u201d") && !Catch::Contains("*** DRAFT"));

  // Approved means final: a second approval is refused and nothing is written (the second reviewer's account is
  // made first, so that the comparison is of the approval alone).
  const std::vector<std::string> second = {"--db",        db,          "certificate", "approve", number, "--as",
                                           "R. Reviewer", "--meaning", "checked"};
  plumb::test::prepare_login(second, dir.path());
  const std::string approved_dump = plumb::test::dump_database(db);
  r = run_plumb(second, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("already approved by Q. Manager"));
  CHECK(plumb::test::dump_database(db) == approved_dump);
}

TEST_CASE("a retired balance or weight is not due and takes no new checks until reinstated", "[cli][audit]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("r.csv", passing_readings);
  const std::vector<std::string> check = {"--db",       db,      "check", "record",     "BAL-A", "--weight",     "W100",
                                          "--readings", "r.csv", "--on",  "2026-11-30", "--as",  "A. Technician"};
  auto r = run_plumb(
      {"--db", db, "instrument", "retire", "BAL-A", "--reason", "replaced by a newer balance", "--as", "Q. Manager"},
      dir.path());
  REQUIRE(r.status == 0);
  // Not due for anything: absent from the due list, and listed as retired (no due date) only with --all.
  r = run_plumb({"--db", db, "due", "--within", "1y", "--on", "2026-12-01", "--format", "json"}, dir.path());
  const json due_within_a_year = json::parse(r.out);
  for (const auto& item : due_within_a_year["items"]) CHECK(item["id"] != "BAL-A");
  r = run_plumb({"--db", db, "due", "--all", "--on", "2026-12-01", "--format", "json"}, dir.path());
  const json everything = json::parse(r.out);
  int listed = 0;
  for (const auto& item : everything["items"])
    if (item["id"] == "BAL-A") {
      ++listed;
      CHECK(item["status"] == "retired");
      CHECK(item["due_on"].is_null());
    }
  CHECK(listed == 1);
  r = run_plumb(check, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("BAL-A was retired") && Catch::Contains("replaced by a newer balance"));
  REQUIRE(run_plumb({"--db", db, "instrument", "reinstate", "BAL-A", "--reason", "needed again", "--as", "Q. Manager"},
                    dir.path())
              .status == 0);

  REQUIRE(run_plumb({"--db", db, "weight", "retire", "W100", "--reason", "dropped on the floor", "--as", "Q. Manager"},
                    dir.path())
              .status == 0);
  r = run_plumb({"--db", db, "due", "--all", "--on", "2026-12-01", "--format", "json"}, dir.path());
  const json items = json::parse(r.out)["items"];
  REQUIRE(items.size() == 2);
  CHECK(items[0]["id"] == "BAL-A");
  CHECK(items[0]["status"] != "retired");
  CHECK(items[1]["id"] == "W100");
  CHECK(items[1]["status"] == "retired");
  r = run_plumb(check, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("--weight W100 was retired"));
  REQUIRE(run_plumb({"--db", db, "weight", "reinstate", "W100", "--reason", "recalibrated", "--as", "Q. Manager"},
                    dir.path())
              .status == 0);
  CHECK(run_plumb(check, dir.path()).status == 0);

  // History kept: the four events are in the instrument's and the lab's trail.
  r = run_plumb({"--db", db, "audit", "log", "--instrument", "BAL-A", "--format", "json"}, dir.path());
  int service = 0;
  const json trail = json::parse(r.out);
  for (const auto& rec : trail["records"]) service += rec["table"] == "service_events" ? 1 : 0;
  CHECK(service == 2);
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);
}

TEST_CASE("audit verify exits 1 naming what the sqlite3 shell changed", "[cli][audit]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("r.csv", passing_readings);
  REQUIRE(run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on",
                     "2026-11-30", "--as", "A. Technician"},
                    dir.path())
              .status == 0);
  auto r = run_plumb({"--db", db, "audit", "verify"}, dir.path());
  REQUIRE(r.status == 0);
  // Records: init 1 + weight 2 + balance 2 + the run 1 = 6; rows: 5 + the run, its weight link, 10 readings = 17;
  // besides them the test helper's accounts, one row each.
  const long long accounts = plumb::test::account_records(db);
  CHECK_THAT(r.out, Catch::Contains("Audit trail verified: " + std::to_string(6 + accounts) +
                                    " records chained by SHA-256, " + std::to_string(17 + accounts) + " rows") &&
                        Catch::Contains("Last hash: "));

  REQUIRE(sqlite3_shell(db,
                        "DROP TRIGGER readings_no_update; UPDATE readings SET text = '100.0001' WHERE run_id = 1 "
                        "AND seq = 4;") == 0);
  r = run_plumb({"--db", db, "audit", "verify"}, dir.path());
  CHECK(r.status == 1);
  CHECK(r.out.empty());
  CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
  CHECK_THAT(r.err, Catch::Contains("audit verification failed: readings run_id=1,seq=4") &&
                        Catch::Contains("field text is \"100.0001\" in the table but \"100.0004\" was recorded") &&
                        Catch::Contains("by A. Technician"));
}

TEST_CASE("backup copies a verified database and restore puts it back, refusing what fails", "[cli][audit][backup]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("r.csv", passing_readings);
  REQUIRE(run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on",
                     "2026-11-30", "--as", "A. Technician"},
                    dir.path())
              .status == 0);
  auto r = run_plumb({"--db", db, "backup", "copy.db"}, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  // 6 records and 17 rows of the lab and the run (as in the test above), and the helper's accounts, a row each.
  const long long accounts = plumb::test::account_records(db);
  CHECK_THAT(r.out, Catch::Contains("integrity check ok, audit trail verified (" + std::to_string(6 + accounts) +
                                    " records, " + std::to_string(17 + accounts) + " rows)"));
  CHECK(std::filesystem::exists(dir.file("copy.db")));
  CHECK_FALSE(std::filesystem::exists(dir.file("copy.db-wal")));
  CHECK(plumb::test::dump_database(dir.file("copy.db")) == plumb::test::dump_database(db));
  CHECK(run_plumb({"--db", db, "backup", "copy.db"}, dir.path()).status == 2);  // exists: needs --force

  // Restore into a fresh path, then over the live database (which is saved first). The restore is signed, so the
  // lab's key must come along to the new path (doc/audit-trail.md): without it nothing is written.
  r = run_plumb({"--db", "fresh.db", "restore", "copy.db", "--reason", "new lab PC"}, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("fresh.db.key"));
  CHECK_FALSE(std::filesystem::exists(dir.file("fresh.db")));
  std::filesystem::copy_file(dir.file("lab.db.key"), dir.file("fresh.db.key"));
  // No account exists at a path with no database: the one restoring logs in with the backup's accounts.
  std::vector<std::string> fresh = plumb::test::login_options(dir.file("copy.db"), "Lab Tester", dir.path());
  REQUIRE(fresh.size() == 4);
  fresh.insert(fresh.end(), {"--db", "fresh.db", "restore", "copy.db", "--reason", "new lab PC"});
  r = run_plumb(fresh, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK(run_plumb({"--db", "fresh.db", "audit", "verify"}, dir.path()).status == 0);
  REQUIRE(run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on",
                     "2026-12-01", "--as", "A. Technician"},
                    dir.path())
              .status == 0);
  CHECK(run_plumb({"--db", db, "restore", "copy.db", "--reason", "test"}, dir.path()).status == 2);  // needs --force
  r = run_plumb({"--db", db, "restore", "copy.db", "--force", "--reason", "disk failure"}, dir.path());
  REQUIRE(r.status == 0);
  // The backup's 6 records (and the helper's accounts) and the record of the restore; the run of 2026-12-01 is gone
  // (kept in the safety copy).
  const std::string seven = std::to_string(7 + accounts);
  CHECK_THAT(r.out, Catch::Contains(seven + " audit records") &&
                        Catch::Contains("(" + seven + " audit records) was saved as") &&
                        Catch::Contains("removes 1 record recorded after the backup"));
  CHECK(run_plumb({"--db", db, "check", "show", "2"}, dir.path()).status == 2);
  CHECK(run_plumb({"--db", db, "check", "show", "1"}, dir.path()).status == 0);

  // A tampered backup is refused before anything is written; backing up a tampered database keeps nothing.
  REQUIRE(sqlite3_shell(dir.file("copy.db").string(),
                        "DROP TRIGGER weights_no_update; UPDATE weights SET weight_class = 'F1';") == 0);
  const std::string before = plumb::test::dump_database(db);
  r = run_plumb({"--db", db, "restore", "copy.db", "--force", "--reason", "disk failure"}, dir.path());
  CHECK(r.status == 1);
  CHECK_THAT(r.err, Catch::Contains("nothing restored") && Catch::Contains("field weight_class"));
  CHECK(plumb::test::dump_database(db) == before);
  r = run_plumb({"--db", "copy.db", "backup", "copy2.db"}, dir.path());
  CHECK(r.status == 1);
  CHECK_THAT(r.err, Catch::Contains("backup not kept"));
  CHECK_FALSE(std::filesystem::exists(dir.file("copy2.db")));
}
