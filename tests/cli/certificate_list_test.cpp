// Certificates as a list and an approval queue, through the built binary: a small lab issues four
// certificates, one is approved, one superseded by a correction's replacement; every filter and state of
// `certificate list`, the queue with its waiting times, and LAST meaning the last certificate where a
// certificate is meant. Withdrawn certificates (their run voided) are in tests/unit/certificate_list_test.cpp.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include "core/dates.hpp"
#include "support/csv_output.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::column;
using plumb::test::csv_of;
using plumb::test::run_plumb;
using plumb::test::ScratchDir;

namespace {

const std::string ten_readings =
    "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0002\n";
// The same with the last reading one digit higher: a correction of a mistyped reading.
const std::string corrected_readings =
    "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0003\n";

void must(const plumb::test::RunResult& r) {
  INFO("stderr: " << r.err);
  REQUIRE(r.status == 0);
}

/// BAL-A and BAL-B; runs 1 (BAL-A), 2 (BAL-B), 3 (BAL-A) with certificates BC-2026-0001..0003; BC-2026-0002
/// approved; run 1 corrected by run 4, whose certificate BC-2026-0004 supersedes BC-2026-0001.
std::string small_lab(const ScratchDir& dir) {
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("r.csv", ten_readings);
  dir.write("fixed.csv", corrected_readings);
  must(run_plumb({"--db", db, "balance", "add", "BAL-B", "--capacity", "220g", "--readability", "0.1mg", "--every",
                  "7d", "--smallest-net", "200mg", "--since", "2026-01-05"},
                 dir.path()));
  for (const char* balance : {"BAL-A", "BAL-B", "BAL-A"})
    must(run_plumb({"--db", db, "check", "record", balance, "--weight", "W100", "--readings", "r.csv", "--on",
                    "2026-11-30", "--as", "A. Technician"},
                   dir.path()));
  for (const char* run : {"1", "2", "3"})
    must(run_plumb({"--db", db, "certificate", "issue", run, "--as", "Q. Manager"}, dir.path()));
  must(run_plumb({"--db", db, "certificate", "approve", "BC-2026-0002", "--as", "R. Reviewer", "--meaning",
                  "reviewed and approved"},
                 dir.path()));
  must(run_plumb({"--db", db, "check", "correct", "1", "--readings", "fixed.csv", "--reason", "last reading mistyped",
                  "--as", "Q. Manager"},
                 dir.path()));
  return db;
}

json list_json(const std::string& db, const ScratchDir& dir, std::vector<std::string> filters) {
  std::vector<std::string> args = {"--db", db, "certificate", "list", "--format", "json"};
  args.insert(args.end(), filters.begin(), filters.end());
  const auto r = run_plumb(args, dir.path());
  INFO("stderr: " << r.err);
  REQUIRE(r.status == 0);
  return json::parse(r.out);
}

std::vector<std::string> numbers(const json& items) {
  std::vector<std::string> out;
  for (const auto& c : items) out.push_back(c["number"].get<std::string>());
  return out;
}

using Numbers = std::vector<std::string>;

}  // namespace

TEST_CASE("certificate list: every state, instrument and issue-date filter", "[cli][certificate-list]") {
  ScratchDir dir;
  const auto db = small_lab(dir);

  const json all = list_json(db, dir, {});
  CHECK(numbers(all) == Numbers{"BC-2026-0001", "BC-2026-0002", "BC-2026-0003", "BC-2026-0004"});
  CHECK(all[0]["state"] == "superseded");
  CHECK(all[0]["replaced_by"] == "BC-2026-0004");
  CHECK(all[1]["state"] == "approved");
  CHECK(all[1]["approved_by"] == "R. Reviewer");
  CHECK(all[2]["state"] == "draft");
  CHECK(all[3]["state"] == "draft");
  CHECK(all[3]["run_id"] == 4);
  CHECK(all[3]["instrument"] == "BAL-A");
  CHECK(all[3]["procedure"] == "repeatability");
  CHECK(all[3]["check_date"] == "2026-11-30");
  CHECK(all[3]["operator"] == "A. Technician");

  CHECK(numbers(list_json(db, dir, {"--state", "draft"})) == Numbers{"BC-2026-0003", "BC-2026-0004"});
  CHECK(numbers(list_json(db, dir, {"--state", "approved"})) == Numbers{"BC-2026-0002"});
  CHECK(numbers(list_json(db, dir, {"--state", "superseded"})) == Numbers{"BC-2026-0001"});
  CHECK(list_json(db, dir, {"--state", "withdrawn"}).empty());
  CHECK(numbers(list_json(db, dir, {"--instrument", "BAL-B"})) == Numbers{"BC-2026-0002"});
  CHECK(numbers(list_json(db, dir, {"--instrument", "BAL-A", "--state", "draft"})) ==
        Numbers{"BC-2026-0003", "BC-2026-0004"});

  // Issue dates are the UTC date the certificates were issued (all today): a window around that day finds all
  // four, the day before or after none.
  const std::string issued = all[0]["issued_at"].get<std::string>().substr(0, 10);
  const std::string before = plumb::to_string(plumb::add_days(plumb::parse_date(issued), -1));
  const std::string after = plumb::to_string(plumb::add_days(plumb::parse_date(issued), 1));
  CHECK(list_json(db, dir, {"--from", issued, "--to", issued}).size() == 4);
  CHECK(list_json(db, dir, {"--from", before, "--to", after}).size() == 4);
  CHECK(list_json(db, dir, {"--from", after}).empty());
  CHECK(list_json(db, dir, {"--to", before}).empty());
  CHECK(numbers(list_json(db, dir, {"--to", issued, "--state", "approved"})) == Numbers{"BC-2026-0002"});
}

TEST_CASE("certificate list as text: aligned columns, the filters in words", "[cli][certificate-list]") {
  ScratchDir dir;
  const auto db = small_lab(dir);
  auto r = run_plumb({"--db", db, "certificate", "list"}, dir.path());
  must(r);
  std::vector<std::string> lines;
  for (std::size_t start = 0, end; (end = r.out.find('\n', start)) != std::string::npos; start = end + 1)
    lines.push_back(r.out.substr(start, end - start));
  REQUIRE(lines.size() == 6);  // title, header, four certificates
  CHECK(lines[0] == "Certificates: 4");
  // Every column starts where its header starts.
  const std::string& header = lines[1];
  for (const char* name : {"instrument", "procedure", "check date", "issued", "state", "approved by"}) {
    INFO(name);
    const auto at = header.find(name);
    REQUIRE(at != std::string::npos);
    for (std::size_t i = 2; i < lines.size(); ++i) {
      INFO(lines[i]);
      CHECK(lines[i][at - 1] == ' ');
      CHECK(lines[i][at] != ' ');
    }
  }
  CHECK_THAT(lines[2], Catch::StartsWith("  BC-2026-0001") && Catch::Contains("superseded by BC-2026-0004"));
  CHECK_THAT(lines[3], Catch::Contains("BAL-B") && Catch::Contains("approved") && Catch::EndsWith("R. Reviewer"));
  CHECK_THAT(lines[4], Catch::Contains("draft") && Catch::EndsWith("-"));

  r = run_plumb({"--db", db, "certificate", "list", "--state", "withdrawn", "--instrument", "BAL-A"}, dir.path());
  must(r);
  CHECK(r.out == "Certificates (state withdrawn, instrument BAL-A): 0\n  none matches.\n");
}

TEST_CASE("certificate list as CSV: one record per certificate, read back by a CSV parser",
          "[cli][certificate-list][csv]") {
  ScratchDir dir;
  const auto db = small_lab(dir);
  const json rows = csv_of(dir, {"--db", db, "certificate", "list", "--format", "csv"});
  REQUIRE(rows.size() == 5);
  CHECK(rows[0][0] == "number");
  CHECK(rows[1][column(rows, "state")] == "superseded");
  CHECK(rows[1][column(rows, "replaced_by")] == "BC-2026-0004");
  CHECK(rows[2][column(rows, "approved_by")] == "R. Reviewer");
  CHECK(rows[2][column(rows, "instrument")] == "BAL-B");
  CHECK(rows[3][column(rows, "approved_by")] == "");
  CHECK(rows[4][column(rows, "run_id")] == "4");
  CHECK(rows[4][column(rows, "check_date")] == "2026-11-30");
}

TEST_CASE("certificate queue: drafts oldest first with their wait, and approving one takes it off",
          "[cli][certificate-list][queue]") {
  ScratchDir dir;
  const auto db = small_lab(dir);
  const std::string issued = list_json(db, dir, {})[0]["issued_at"].get<std::string>().substr(0, 10);
  const std::string five_days_on = plumb::to_string(plumb::add_days(plumb::parse_date(issued), 5));

  auto r = run_plumb({"--db", db, "certificate", "queue", "--on", five_days_on, "--format", "json"}, dir.path());
  must(r);
  json q = json::parse(r.out);
  CHECK(q["on"] == five_days_on);
  REQUIRE(q["items"].size() == 2);
  CHECK(numbers(q["items"]) == Numbers{"BC-2026-0003", "BC-2026-0004"});
  CHECK(q["items"][0]["waiting_days"] == 5);
  CHECK(q["items"][1]["waiting_days"] == 5);
  CHECK(q["items"][0]["operator"] == "A. Technician");

  r = run_plumb({"--db", db, "certificate", "queue", "--on", five_days_on}, dir.path());
  must(r);
  CHECK_THAT(r.out, Catch::StartsWith("Awaiting approval on " + five_days_on + ": 2 draft certificate(s)") &&
                        Catch::Contains("5 days") && Catch::Contains("someone other than the user who recorded or corrected"));
  // The day they were issued, they have waited less than a day.
  r = run_plumb({"--db", db, "certificate", "queue", "--on", issued}, dir.path());
  must(r);
  CHECK_THAT(r.out, Catch::Contains("issued today"));

  const json csv = csv_of(dir, {"--db", db, "certificate", "queue", "--on", five_days_on, "--format", "csv"});
  REQUIRE(csv.size() == 3);
  CHECK(csv[1][column(csv, "waiting_days")] == "5");

  r = run_plumb({"--db", db, "certificate", "queue", "--instrument", "BAL-B"}, dir.path());
  must(r);
  CHECK_THAT(r.out, Catch::Contains("0 draft certificate(s)") && Catch::Contains("nothing waits for a reviewer"));

  must(run_plumb({"--db", db, "certificate", "approve", "BC-2026-0003", "--as", "R. Reviewer", "--meaning",
                  "reviewed and approved"},
                 dir.path()));
  r = run_plumb({"--db", db, "certificate", "queue", "--on", five_days_on, "--format", "json"}, dir.path());
  must(r);
  q = json::parse(r.out);
  CHECK(numbers(q["items"]) == Numbers{"BC-2026-0004"});
}

TEST_CASE("LAST means the last certificate where a certificate is meant, the last run where a run is",
          "[cli][certificate-list][selectors]") {
  ScratchDir dir;
  const auto db = small_lab(dir);
  // Run 5 has no certificate: the last run is 5, the last certificate BC-2026-0004 (of run 4).
  must(run_plumb({"--db", db, "check", "record", "BAL-B", "--weight", "W100", "--readings", "r.csv", "--on",
                  "2026-11-30", "--as", "A. Technician"},
                 dir.path()));
  auto r = run_plumb({"--db", db, "certificate", "show", "LAST", "--format", "json"}, dir.path());
  must(r);
  CHECK(json::parse(r.out)["number"] == "BC-2026-0004");
  r = run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path());
  must(r);
  CHECK(json::parse(r.out)["run_id"] == 5);
  // A run number still names that run's certificate; a certificate number names itself.
  r = run_plumb({"--db", db, "certificate", "show", "2", "--format", "json"}, dir.path());
  must(r);
  CHECK(json::parse(r.out)["number"] == "BC-2026-0002");
  r = run_plumb({"--db", db, "certificate", "show", "5"}, dir.path());
  CHECK(r.status == 2);
  CHECK(r.err == "plumb: run 5 has no certificate yet; issue one with `plumb certificate issue 5`.\n");

  // approve LAST approves the last certificate (BC-2026-0004), not run 5's.
  r = run_plumb(
      {"--db", db, "certificate", "approve", "LAST", "--as", "R. Reviewer", "--meaning", "reviewed and approved"},
      dir.path());
  must(r);
  CHECK_THAT(r.out, Catch::StartsWith("Certificate BC-2026-0004 approved by R. Reviewer."));
  // issue LAST takes a run selector: the last run, 5, gets BC-2026-0005.
  r = run_plumb({"--db", db, "certificate", "issue", "LAST", "--format", "json"}, dir.path());
  must(r);
  const json issued = json::parse(r.out);
  CHECK(issued["number"] == "BC-2026-0005");
  CHECK(issued["check"]["run_id"] == 5);
}
