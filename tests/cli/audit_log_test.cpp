// `plumb audit log` as an inspector reads it: one line per record with time, who and what, decimals as masses
// with their unit (not "scale=4, units=1000001"), filters by date and person, and free text that cannot forge a
// line. Record times are the wall clock (UTC), so the dates are computed here, not written in.
#include <catch2/catch.hpp>

#include <SQLiteCpp/Database.h>
#include <nlohmann/json.hpp>

#include <ctime>
#include <filesystem>
#include <regex>
#include <set>
#include <sstream>

#include "support/csv_output.hpp"
#include "support/insider.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::run_plumb;

namespace {

std::string utc_date(int days_from_today) {
  const std::time_t t = std::time(nullptr) + static_cast<std::time_t>(days_from_today) * 86400;
  std::tm utc{};
  gmtime_r(&t, &utc);
  char text[11];
  std::strftime(text, sizeof text, "%Y-%m-%d", &utc);
  return text;
}

std::vector<std::string> lines_of(const std::string& text) {
  std::vector<std::string> out;
  std::istringstream in(text);
  for (std::string l; std::getline(in, l);) out.push_back(l);
  return out;
}

// The test helper logs in through accounts it creates (the test administrator at init, each member at its first
// command): those records are counted from the trail by their table, so the lab's own records stay counted exactly.
bool is_account_table(const std::string& table) {
  static const std::set<std::string> account_tables = {"users",    "passwords",   "account_events", "security_settings",
                                                       "sessions", "session_ends"};
  return account_tables.count(table) > 0;
}

std::size_t account_records(const std::string& db, const std::filesystem::path& dir) {
  const auto r = run_plumb({"--db", db, "audit", "log", "--format", "json"}, dir);
  REQUIRE(r.status == 0);
  const json log = json::parse(r.out);
  std::size_t n = 0;
  for (const auto& record : log["records"])
    if (is_account_table(record.value("table", ""))) ++n;
  return n;
}

const std::string readings =
    "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0002\n";

}  // namespace

TEST_CASE("audit log prints one readable line per record, decimals with their unit", "[cli][audit-log]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("r.csv", readings);
  REQUIRE(run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on",
                     "2026-11-30", "--as", "A. Technician"},
                    dir.path())
              .status == 0);
  const auto r = run_plumb({"--db", db, "audit", "log"}, dir.path());
  REQUIRE(r.status == 0);
  const auto lines = lines_of(r.out);
  // The heading, then the lab, the weight, its certificate, the instrument, the balance and the run, besides the
  // helper's accounts (at least the administrator and A. Technician, each with a password).
  const std::size_t accounts = account_records(db, dir.path());
  CHECK(accounts >= 4);
  REQUIRE(lines.size() == 7 + accounts);
  const std::regex record(R"(#\d+ +\d{4}-\d\d-\d\d \d\d:\d\d  \S.*)");
  for (std::size_t i = 1; i < lines.size(); ++i) {
    INFO(lines[i]);
    CHECK(std::regex_match(lines[i], record));
  }
  // example_lab: W100 with correction 0.03 mg and U 0.05 mg, stored as decimal grams "0.00003" and "0.00005".
  CHECK_THAT(r.out, Catch::Contains("recorded certificate RC-2291 of weight W100: correction +0.03 mg, U 0.05 mg"));
  CHECK_THAT(r.out, Catch::Contains("set balance BAL-A: capacity 220 g, d = 0.1 mg"));
  CHECK_THAT(lines.back(), Catch::EndsWith("  A. Technician [" + plumb::test::test_login("A. Technician") +
                                           "]  recorded check run 1 on BAL-A (repeatability, 2026-11-30, pass; 10 "
                                           "readings)"));
  CHECK_THAT(r.out, !Catch::Contains("scale=") && !Catch::Contains("units="));
}

TEST_CASE("audit log filters by date and by person", "[cli][audit-log]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("r.csv", readings);
  REQUIRE(run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on",
                     "2026-11-30", "--as", "A. Technician"},
                    dir.path())
              .status == 0);
  const auto count = [&](const std::vector<std::string>& filter) {
    std::vector<std::string> args = {"--db", db, "audit", "log", "--format", "json"};
    args.insert(args.end(), filter.begin(), filter.end());
    const auto r = run_plumb(args, dir.path());
    INFO(r.err);
    REQUIRE(r.status == 0);
    return json::parse(r.out)["records"].size();
  };
  // The same, without the records of the helper's accounts (a member's own password change is by that member).
  const auto lab_count = [&](const std::vector<std::string>& filter) {
    std::vector<std::string> args = {"--db", db, "audit", "log", "--format", "json"};
    args.insert(args.end(), filter.begin(), filter.end());
    const auto r = run_plumb(args, dir.path());
    REQUIRE(r.status == 0);
    const json log = json::parse(r.out);
    std::size_t n = 0;
    for (const auto& record : log["records"])
      if (!is_account_table(record.value("table", ""))) ++n;
    return n;
  };
  // Everything was recorded today (UTC), or yesterday if the test ran across midnight: the lab, the weight, its
  // certificate, the instrument, the balance and the run, and the helper's accounts.
  const std::size_t accounts = account_records(db, dir.path());
  CHECK(accounts >= 4);
  CHECK(count({}) == 6 + accounts);
  CHECK(count({"--from", utc_date(-1), "--to", utc_date(0)}) == 6 + accounts);
  CHECK(count({"--from", utc_date(1)}) == 0);
  CHECK(count({"--to", utc_date(-2)}) == 0);
  const std::string technician = plumb::test::test_login("A. Technician");
  CHECK(lab_count({"--author", technician}) == 1);
  CHECK(count({"--instrument", "BAL-A", "--author", technician}) == 1);
  const std::size_t by_technician = count({"--author", technician});

  const auto r = run_plumb({"--db", db, "audit", "log", "--author", technician, "--from", utc_date(-1)}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::StartsWith("Audit trail of the whole lab, from " + utc_date(-1) +
                                      " on (UTC), written by A. Technician (" + technician +
                                      "): " + std::to_string(by_technician) + " record(s)"));
  // A login that is no account is a mistake, not an empty answer.
  const auto nobody = run_plumb({"--db", db, "audit", "log", "--author", "nobody-here"}, dir.path());
  CHECK(nobody.status == 2);
  CHECK(nobody.err ==
        "plumb: --author \"nobody-here\" is not the login of any user account (see `plumb user "
        "list`).\n");
}

TEST_CASE("a name with a line break cannot forge an audit line", "[cli][audit-log][security]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const std::string forged = "A. Technician\n#99     2026-12-01 09:00  Q. Manager  approved certificate id 1";
  dir.write("first.pw", "a-first-password-long-enough\n");
  std::filesystem::permissions(dir.file("first.pw"),
                               std::filesystem::perms::owner_read | std::filesystem::perms::owner_write);
  const auto before = run_plumb({"--db", db, "audit", "log"}, dir.path());
  REQUIRE(before.status == 0);
  // The printed name of an account is the only name plumb records: the forged one is offered there.
  const auto add = run_plumb({"--db", db, "user", "add", "forger", "--name", forged, "--role", "technician",
                              "--new-password-file", "first.pw", "--as", "Test Administrator"},
                             dir.path());
  // Refused at the door (a control character in a name) or recorded as given: either way not as a second record.
  REQUIRE((add.status == 0 || add.status == 2));
  const auto r = run_plumb({"--db", db, "audit", "log"}, dir.path());
  REQUIRE(r.status == 0);
  const auto lines = lines_of(r.out);
  if (add.status == 2) CHECK(r.out.substr(r.out.find('\n')) == before.out.substr(before.out.find('\n')));
  for (const auto& l : lines) CHECK_THAT(l, !Catch::StartsWith("#99"));
  if (add.status == 0) CHECK_THAT(r.out, Catch::Contains("A. Technician\\n#99"));  // shown, escaped, on its line
}

TEST_CASE("a line break written into the trail behind plumb's back cannot forge a line of the text or CSV log",
          "[cli][audit-log][security]") {
  // An insider with the database file writes control characters into the last record's name and reason with
  // SQLite, recomputing the chain (tests/support/insider.hpp). The log must still print one line per record, the
  // CSV one row per record, and verification must name the record as changed.
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir);
  const auto before = run_plumb({"--db", db.string(), "audit", "log", "--format", "json"}, dir.path());
  REQUIRE(before.status == 0);
  const std::size_t records = json::parse(before.out)["records"].size();
  const std::string forged_actor = "Lab Tester\n#99     2026-12-01 09:00  Q. Manager [qm]  approved certificate id 1";
  const std::string forged_reason = "none\r\n#100    2026-12-01 09:01  Q. Manager [qm]  voided check run 1";
  plumb::test::insider_rewrite(db, [&](SQLite::Database& sql) {
    SQLite::Statement edit(sql,
                           "UPDATE audit_log SET actor = ?, reason = ? WHERE seq = (SELECT max(seq) FROM audit_log)");
    edit.bind(1, forged_actor);
    edit.bind(2, forged_reason);
    REQUIRE(edit.exec() == 1);
  });

  const auto text = run_plumb({"--db", db.string(), "audit", "log"}, dir.path());
  REQUIRE(text.status == 0);
  const auto lines = lines_of(text.out);
  CHECK(lines.size() == records + 1);  // the heading and one line per record
  for (std::size_t i = 1; i < lines.size(); ++i) {
    INFO(lines[i]);
    CHECK_THAT(lines[i], !Catch::StartsWith("#99 ") && !Catch::StartsWith("#100 "));
  }
  CHECK_THAT(lines.back(), Catch::Contains("Lab Tester\\n#99") && Catch::Contains("none\\r\\n#100"));

  const auto csv = run_plumb({"--db", db.string(), "audit", "log", "--format", "csv"}, dir.path());
  REQUIRE(csv.status == 0);
  const json rows = plumb::test::parse_csv(dir, csv.out);
  REQUIRE(rows.size() == records + 1);  // header and one row per record: the line break stays inside its field
  const auto& header = rows[0];
  const auto column = [&](const char* name) {
    for (std::size_t i = 0; i < header.size(); ++i)
      if (header[i] == name) return i;
    FAIL("no column " << name);
    return std::size_t{0};
  };
  CHECK(rows.back()[column("actor")] == forged_actor);
  CHECK(rows.back()[column("reason")] == forged_reason);

  const auto verify = run_plumb({"--db", db.string(), "audit", "verify"}, dir.path());
  CHECK(verify.status == 1);
  CHECK_THAT(verify.err + verify.out, Catch::Contains("checkpoint"));
}
