// A year of an invented lab, end to end: weekly checks, a reference weight recalibrated mid-year, a calibration
// corrected, an instrument moved, a run voided, a certificate superseded and its replacement approved by a second
// person; every list, summary and certificate asserted along the way, and at the end one standing for every item
// across every output.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include <fstream>
#include <regex>
#include <sstream>

#include "support/margin.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::grams_near;
using plumb::test::run_plumb;
using plumb::test::ug;

namespace {

// Ten readings of a 100 g weight on a 0.1 mg balance: mean 100.00023 g (tests/unit/repeatability_test.cpp).
const std::string weekly_readings =
    "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0002\n";

class Lab {
 public:
  Lab() : db_(dir_.file("year.db").string()) {
    dir_.write("r.csv", weekly_readings);
    dir_.write("cal.csv", plumb::test::calibration_run_file());
  }
  plumb::test::RunResult run(std::vector<std::string> args) const {
    args.insert(args.begin(), {"--db", db_});
    return run_plumb(args, dir_.path());
  }
  void ok(const std::vector<std::string>& args) const {
    const auto r = run(args);
    INFO("plumb " << args[0] << " " << (args.size() > 1 ? args[1] : "") << ": " << r.err);
    REQUIRE(r.status == 0);
  }
  json json_of(std::vector<std::string> args) const {
    args.emplace_back("--format");
    args.emplace_back("json");
    const auto r = run(args);
    INFO(r.err);
    REQUIRE(r.status == 0);
    return json::parse(r.out);
  }
  json weekly(const std::string& balance, const std::string& on) const {
    return json_of(
        {"check", "record", balance, "--weight", "W100", "--readings", "r.csv", "--on", on, "--as", "T. Okafor"});
  }
  [[nodiscard]] const plumb::test::ScratchDir& dir() const { return dir_; }

 private:
  plumb::test::ScratchDir dir_;
  std::string db_;
};

std::string state_of(const json& list, const std::string& number) {
  for (const auto& c : list)
    if (c["number"] == number) return c["state"].get<std::string>();
  return "absent";
}

}  // namespace

TEST_CASE("a year in the lab: every lifecycle step, and one standing in every output", "[cli][lifecycle][year]") {
  Lab lab;
  lab.ok({"init", "--lab", "Larkfield Quality Laboratory"});
  // W100's first certificate runs out on 2026-06-30; the calibration weights are in date all year.
  lab.ok({"weight", "add", "W100", "--nominal", "100g", "--class", "E2", "--correction", "0.03mg", "--uncertainty",
          "0.05mg", "--k", "2", "--certificate", "LK-2025-117", "--calibrated", "2025-12-01", "--due", "2026-06-30"});
  for (const auto& [id, nominal, u] : std::vector<std::tuple<std::string, std::string, std::string>>{
           {"W20", "20g", "0.025mg"}, {"W50", "50g", "0.03mg"}, {"W200", "200g", "0.10mg"}})
    lab.ok({"weight", "add", id, "--nominal", nominal, "--class", "E2", "--correction", "0mg", "--uncertainty", u,
            "--k", "2", "--certificate", "LK-" + id, "--calibrated", "2026-01-02", "--due", "2027-01-02"});
  lab.ok({"balance",       "add",        "BAL-A",    "--capacity", "220g",
          "--readability", "0.1mg",      "--every",  "7d",         "--smallest-net",
          "200mg",         "--location", "Room 2",   "--maker",    "Larkfield Instruments",
          "--model",       "LW 220",     "--serial", "LW-5521",    "--since",
          "2026-01-05"});
  lab.ok({"balance", "set-calibration", "BAL-A", "--class", "I", "--e", "1mg", "--tolerance", "r76", "--decision-rule",
          "simple", "--calibrate-every", "1y", "--since", "2026-01-05"});
  lab.ok({"balance", "add", "BAL-B", "--capacity", "220g", "--readability", "0.1mg", "--every", "7d", "--smallest-net",
          "200mg", "--location", "Room 4", "--since", "2026-01-05"});

  // January to June: monthly weekly checks against W100's first certificate (reference 100 g + 0.03 mg).
  json last;
  for (const char* on :
       {"2026-01-05", "2026-02-02", "2026-03-02", "2026-04-06", "2026-05-04", "2026-06-01", "2026-06-29"}) {
    last = lab.weekly("BAL-A", on);
    CHECK(last["verdict"] == "pass");
  }
  CHECK_THAT(last["reference_g"].get<double>(), grams_near(100.00003, ug(0.001)));
  lab.weekly("BAL-B", "2026-06-29");

  // July: W100 is overdue; the weekly check is refused until the new certificate is registered.
  auto r = lab.run({"check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on", "2026-07-06", "--as",
                    "T. Okafor"});
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("W100"));
  lab.ok({"weight", "recalibrate", "W100", "--certificate", "LK-2026-088", "--calibrated", "2026-07-01", "--due",
          "2027-07-01", "--correction", "0.05mg", "--uncertainty", "0.05mg", "--k", "2", "--as", "M. Haddad"});
  // By hand: reference 100 g + 0.05 mg = 100.00005 g; bias 100.00023 - 100.00005 = +0.18 mg.
  last = lab.weekly("BAL-A", "2026-07-06");
  CHECK_THAT(last["reference_g"].get<double>(), grams_near(100.00005, ug(0.001)));
  CHECK_THAT(last["bias_g"].get<double>(), grams_near(0.00018, ug(0.001)));
  // The June run keeps the first certificate: history is not rewritten by a recalibration.
  const json june = lab.json_of({"check", "show", "7"});
  CHECK_THAT(june["reference_g"].get<double>(), grams_near(100.00003, ug(0.001)));
  const json w100 = lab.json_of({"weight", "show", "W100"});
  CHECK(w100.dump().find("LK-2025-117") != std::string::npos);
  CHECK(w100.dump().find("LK-2026-088") != std::string::npos);

  // August: the yearly calibration, certified, then corrected (the room was at 22 degC, not 20).
  const json cal = lab.json_of({"check", "record", "BAL-A", "--procedure", "calibration", "--readings", "cal.csv",
                                "--temperature", "20C", "--pressure", "1013.25hPa", "--humidity", "50%",
                                "--air-formula", "oiml-r111", "--on", "2026-08-03", "--as", "T. Okafor"});
  CHECK(cal["verdict"] == "pass");
  const std::int64_t cal_run = cal["run_id"].get<std::int64_t>();
  const json cal_cert = lab.json_of({"certificate", "issue", std::to_string(cal_run), "--as", "M. Haddad"});
  const std::string cal_number = cal_cert["number"].get<std::string>();
  const json corrected = lab.json_of({"check", "correct", std::to_string(cal_run), "--temperature", "22C", "--reason",
                                      "room temperature transcribed as 20 for 22", "--as", "M. Haddad"});
  // OIML R 111-1:2004 E.3-1 at 22 degC, 1013.25 hPa, 50 %: 1.190498 kg/m3 (worked in tests/cli/lifecycle_test.cpp).
  CHECK(corrected["correction"]["environment"]["air_density_kg_m3"].get<double>() == Approx(1.190498).epsilon(2e-6));
  const std::string replacement = corrected["new_certificate"].get<std::string>();
  // The operator of the corrected run may not approve its replacement, nor may the author of the correction; a
  // third person does (separation of duties by account: exit 4, refused).
  r = lab.run({"certificate", "approve", replacement, "--meaning", "reviewed and approved", "--as", "T. Okafor"});
  CHECK(r.status == 4);
  CHECK_THAT(r.err, Catch::Contains("T. Okafor") && Catch::Contains("neither recorded nor corrected"));
  r = lab.run({"certificate", "approve", replacement, "--meaning", "reviewed and approved", "--as", "M. Haddad"});
  CHECK(r.status == 4);
  CHECK_THAT(r.err, Catch::Contains("M. Haddad") && Catch::Contains("recorded the correction"));
  lab.ok({"certificate", "approve", replacement, "--meaning", "reviewed and approved", "--as", "E. Marsh"});

  // September: BAL-A moves to Room 5; the next certificate says so, the earlier ones keep Room 2.
  lab.ok({"instrument", "update", "BAL-A", "--location", "Room 5", "--from", "2026-09-01", "--reason",
          "moved to the new weighing room", "--as", "M. Haddad"});
  lab.weekly("BAL-A", "2026-09-07");
  const json sept = lab.json_of({"certificate", "issue", "LAST", "--as", "M. Haddad"});
  CHECK(sept["instrument"]["location"] == "Room 5");
  CHECK(sept["instrument"]["serial"] == "LW-5521");
  const json july_cert = lab.json_of({"certificate", "issue", "9", "--as", "M. Haddad"});
  CHECK(july_cert["instrument"]["location"] == "Room 2");

  // The check of 2026-09-14 is entered twice; the duplicate, already certified, is voided.
  lab.weekly("BAL-A", "2026-09-14");
  const json dup = lab.weekly("BAL-A", "2026-09-14");
  const std::string dup_run = std::to_string(dup["run_id"].get<std::int64_t>());
  const json dup_cert = lab.json_of({"certificate", "issue", dup_run, "--as", "M. Haddad"});
  lab.ok({"check", "void", dup_run, "--reason", "entered twice", "--as", "M. Haddad"});

  // Certificates as a list, and the queue of drafts.
  const json certs = lab.json_of({"certificate", "list"});
  CHECK(state_of(certs, cal_number) == "superseded");
  CHECK(state_of(certs, replacement) == "approved");
  CHECK(state_of(certs, sept["number"].get<std::string>()) == "draft");
  CHECK(state_of(certs, dup_cert["number"].get<std::string>()) == "withdrawn");
  const json withdrawn = lab.json_of({"certificate", "list", "--state", "withdrawn"});
  REQUIRE(withdrawn.size() == 1);
  CHECK(withdrawn[0]["number"] == dup_cert["number"]);
  r = lab.run({"certificate", "queue"});
  CHECK_THAT(r.out, Catch::Contains(sept["number"].get<std::string>()));
  CHECK(r.out.find(replacement) == std::string::npos);

  // October: BAL-B is retired.
  lab.ok({"instrument", "retire", "BAL-B", "--reason", "replaced by BAL-A", "--as", "M. Haddad"});

  // 2026-12-01: BAL-A's last current weekly check is 2026-09-14 (the duplicate is void): overdue since 09-21.
  // Its calibration (the correction of 2026-08-03) is in date until 2027-08-03. BAL-B is retired.
  const std::string on = "2026-12-01";
  const json due = lab.json_of({"due", "--all", "--on", on});
  std::map<std::string, std::string> due_status;
  for (const auto& i : due["items"])
    if (i["kind"] == "balance") due_status[i["id"].get<std::string>()] = i["status"].get<std::string>();
  CHECK(due_status["BAL-A"] == "overdue");
  CHECK(due_status["BAL-B"] == "retired");

  const json summary = lab.json_of({"summary", "--on", on});
  std::map<std::string, std::string> summary_status;
  for (const auto& i : summary["instruments"])
    summary_status[i["id"].get<std::string>()] = i["status"].get<std::string>();
  CHECK(summary_status == std::map<std::string, std::string>{{"BAL-A", "overdue"}, {"BAL-B", "retired"}});

  for (const auto& [id, expected] : summary_status) {
    const json page = lab.json_of({"balance", "show", id, "--on", on});
    CHECK(page["standing"]["status"] == expected);
  }
  // The registry list is as of today (after 2026-12-01): still overdue and retired.
  const json list = lab.json_of({"balance", "list"});
  REQUIRE(list.size() == 2);
  for (const auto& b : list) CHECK(b["status"] == summary_status[b["id"].get<std::string>()]);

  lab.ok({"report", "--html", "year.html", "--on", on});
  std::ifstream html_file(lab.dir().path() / "year.html");
  std::stringstream html;
  html << html_file.rdbuf();
  for (const auto& [id, expected] : summary_status) {
    // The overview's row of the instrument: id (linking its page), title, location, status.
    const std::regex section("<a href=\"[^\"]+\">" + id +
                             "</a></td><td>[^<]*</td><td>[^<]*</td><td class=\"[^\"]+\">([^<]+)</td>");
    std::smatch m;
    const std::string text = html.str();
    REQUIRE(std::regex_search(text, m, section));
    CHECK(m[1].str() == expected);
  }

  // History keeps every run, the void one marked; the trail verifies.
  r = lab.run({"history", "BAL-A"});
  CHECK_THAT(r.out, Catch::Contains("VOID: entered twice"));
  CHECK(lab.run({"audit", "verify"}).status == 0);
}
