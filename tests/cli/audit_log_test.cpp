// `plumb audit log` as an inspector reads it: one line per record with time, who and what, decimals as masses
// with their unit (not "scale=4, units=1000001"), filters by date and person, and free text that cannot forge a
// line. Record times are the wall clock (UTC), so the dates are computed here, not written in.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include <ctime>
#include <regex>
#include <sstream>

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
  // The heading, then the lab, the weight, its certificate, the instrument, the balance and the run.
  REQUIRE(lines.size() == 7);
  const std::regex record(R"(#\d+ +\d{4}-\d\d-\d\d \d\d:\d\d  \S.*)");
  for (std::size_t i = 1; i < lines.size(); ++i) {
    INFO(lines[i]);
    CHECK(std::regex_match(lines[i], record));
  }
  // example_lab: W100 with correction 0.03 mg and U 0.05 mg, stored as decimal grams "0.00003" and "0.00005".
  CHECK_THAT(r.out, Catch::Contains("recorded certificate RC-2291 of weight W100: correction +0.03 mg, U 0.05 mg"));
  CHECK_THAT(r.out, Catch::Contains("set balance BAL-A: capacity 220 g, d = 0.1 mg"));
  CHECK_THAT(lines.back(), Catch::EndsWith("  A. Technician  recorded check run 1 on BAL-A (repeatability, "
                                           "2026-11-30, pass; 10 readings)"));
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
  // Everything was recorded today (UTC), or yesterday if the test ran across midnight.
  CHECK(count({}) == 6);
  CHECK(count({"--from", utc_date(-1), "--to", utc_date(0)}) == 6);
  CHECK(count({"--from", utc_date(1)}) == 0);
  CHECK(count({"--to", utc_date(-2)}) == 0);
  CHECK(count({"--as", "A. Technician"}) == 1);
  CHECK(count({"--as", "Nobody Here"}) == 0);
  CHECK(count({"--instrument", "BAL-A", "--as", "A. Technician"}) == 1);

  const auto r = run_plumb({"--db", db, "audit", "log", "--by", "A. Technician", "--from", utc_date(-1)}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::StartsWith("Audit trail of the whole lab, from " + utc_date(-1) +
                                      " on (UTC), by "
                                      "A. Technician: 1 record(s)"));
}

TEST_CASE("a name with a line break cannot forge an audit line", "[cli][audit-log][security]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("r.csv", readings);
  const std::string forged = "A. Technician\n#99     2026-12-01 09:00  Q. Manager  approved certificate id 1";
  const auto rec = run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on",
                              "2026-11-30", "--as", forged},
                             dir.path());
  // Refused at the door (a control character in a name) or recorded as given: either way not as a second record.
  REQUIRE((rec.status == 0 || rec.status == 2));
  const auto r = run_plumb({"--db", db, "audit", "log"}, dir.path());
  REQUIRE(r.status == 0);
  const auto lines = lines_of(r.out);
  CHECK(lines.size() == (rec.status == 0 ? 7u : 6u));
  for (const auto& l : lines) CHECK_THAT(l, !Catch::StartsWith("#99"));
  if (rec.status == 0) CHECK_THAT(r.out, Catch::Contains("A. Technician\\n#99"));  // shown, escaped, on its line
}
