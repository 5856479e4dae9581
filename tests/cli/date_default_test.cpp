// `--on` left out: a recording is dated today, the local date where plumb runs, and says so. The test reads the
// local date itself (C library, before and after the command) rather than trusting plumb's, so a run across
// midnight still has one right answer; the weight and the balance are registered relative to that date.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include <ctime>

#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::run_plumb;

namespace {

std::string local_date(int days_from_today = 0) {
  const std::time_t t = std::time(nullptr) + static_cast<std::time_t>(days_from_today) * 86400;
  std::tm local{};
  localtime_r(&t, &local);
  char text[11];
  std::strftime(text, sizeof text, "%Y-%m-%d", &local);
  return text;
}

const std::string ten_readings =
    "reading\n100.00003\n100.00004\n100.00002\n100.00003\n100.00005\n100.00003\n100.00002\n100.00004\n100.00003\n"
    "100.00003\n";

std::string lab_dated_around_today(const plumb::test::ScratchDir& dir) {
  const std::string db = dir.file("lab.db").string();
  for (const std::vector<std::string>& step : {
           std::vector<std::string>{"--db", db, "init", "--lab", "Example Analytical Lab"},
           {"--db",          db,        "weight",
            "add",           "W100",    "--nominal",
            "100g",          "--class", "E2",
            "--correction",  "0.03mg",  "--uncertainty",
            "0.05mg",        "--k",     "2",
            "--certificate", "RC-2291", "--calibrated",
            local_date(-30), "--due",   local_date(335)},
           {"--db", db, "balance", "add", "SM-02", "--capacity", "120g", "--readability", "0.01mg", "--every", "7d",
            "--smallest-net", "50mg", "--since", local_date(-10)},
       }) {
    const auto r = run_plumb(step, dir.path());
    INFO(r.err);
    REQUIRE(r.status == 0);
  }
  return db;
}

}  // namespace

TEST_CASE("a check recorded without --on is dated today and says so", "[cli][dates]") {
  plumb::test::ScratchDir dir;
  const auto db = lab_dated_around_today(dir);
  dir.write("r.csv", ten_readings);
  const std::string before = local_date();
  auto r = run_plumb(
      {"--db", db, "check", "record", "SM-02", "--weight", "W100", "--readings", "r.csv", "--as", "A. Technician"},
      dir.path());
  const std::string after = local_date();
  INFO(r.err);
  REQUIRE(r.status == 0);
  const bool dated_today = r.out.find("on " + before + " (today) by") != std::string::npos ||
                           r.out.find("on " + after + " (today) by") != std::string::npos;
  CHECK(dated_today);

  r = run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const std::string date = json::parse(r.out)["date"].get<std::string>();
  CHECK((date == before || date == after));
  CHECK_THAT(r.out, !Catch::Contains("(today)"));  // stored as a date; the note is only what the recording said

  // Given explicitly, the date is printed as it was typed, with no note.
  r = run_plumb({"--db", db, "check", "record", "SM-02", "--weight", "W100", "--readings", "r.csv", "--on",
                 local_date(-1), "--as", "A. Technician"},
                dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("on " + local_date(-1) + " by") && !Catch::Contains("(today)"));
}

TEST_CASE("a pipette check recorded without --on is dated today", "[cli][dates]") {
  plumb::test::ScratchDir dir;
  const auto db = lab_dated_around_today(dir);
  dir.write("r.csv", ten_readings);
  REQUIRE(run_plumb({"--db", db, "check", "record", "SM-02", "--weight", "W100", "--readings", "r.csv", "--as",
                     "A. Technician"},
                    dir.path())
              .status == 0);
  REQUIRE(run_plumb({"--db", db, "pipette", "add", "P-07", "--nominal", "100uL", "--range", "fixed", "--every", "3mo",
                     "--since", local_date(-10)},
                    dir.path())
              .status == 0);
  std::string csv = "volume,channel,reading\n";
  for (const char* w :
       {"0.09971", "0.09965", "0.09980", "0.09958", "0.09992", "0.09975", "0.09969", "0.09983", "0.09961", "0.09977"})
    csv += std::string("100uL,1,") + w + "\n";
  dir.write("w.csv", csv);
  const std::string before = local_date();
  const auto r = run_plumb(
      {"--db", db, "check", "record", "P-07", "--procedure", "gravimetric", "--balance", "SM-02", "--water-temp", "20C",
       "--pressure", "1013hPa", "--humidity", "50%", "--readings", "w.csv", "--as", "A. Technician"},
      dir.path());
  const std::string after = local_date();
  INFO(r.err);
  REQUIRE(r.status == 0);
  const bool dated_today = r.out.find("on " + before + " (today) by") != std::string::npos ||
                           r.out.find("on " + after + " (today) by") != std::string::npos;
  CHECK(dated_today);
}
