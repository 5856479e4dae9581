// PDF certificates of a balance calibration and a pipette check, read back with poppler's pdftotext: the number
// and "page x of y" on every page, the verdict, the next due date, the caution line and key table values; and a
// pipette's history quantities, checked against the worked example of tests/cli/pipette_check_test.cpp.
#include <catch2/catch.hpp>

#include <fmt/format.h>

#include <cmath>
#include <cstdio>
#include <nlohmann/json.hpp>
#include <sstream>

#include "support/margin.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::microlitres_near;
using plumb::test::percent_near;
using plumb::test::pp;
using plumb::test::run_plumb;
using plumb::test::ul;

namespace {

bool have_pdftotext() { return std::system("pdftotext -v >/dev/null 2>&1") == 0; }

std::vector<std::string> pdf_pages(const std::filesystem::path& pdf) {
  const std::string cmd = "pdftotext -layout '" + pdf.string() + "' - 2>/dev/null";
  std::string text;
  if (FILE* p = popen(cmd.c_str(), "r")) {
    char buf[4096];
    std::size_t n;
    while ((n = fread(buf, 1, sizeof buf, p)) > 0) text.append(buf, n);
    pclose(p);
  }
  std::vector<std::string> pages;
  std::stringstream ss(text);
  for (std::string page; std::getline(ss, page, '\f');)
    if (page.find_first_not_of(" \n") != std::string::npos) pages.push_back(page);
  return pages;
}

void check_every_page(const std::vector<std::string>& pages, const std::string& number) {
  for (std::size_t i = 0; i < pages.size(); ++i) {
    INFO("page " << i + 1);
    CHECK_THAT(pages[i], Catch::Contains(number));
    CHECK_THAT(pages[i], Catch::Contains(fmt::format("page {} of {}", i + 1, pages.size())));
  }
}

std::string joined(const std::vector<std::string>& pages) {
  std::string all;
  for (const auto& p : pages) all += p;
  return all;
}

// The calibration of tests/cli/calibration_test.cpp: 220 g, d = 0.1 mg, class I, e = 1 mg, r76 tolerance; E2 weights
// with zero corrections, so E = reading - nominal: +0.1, +0.2, +0.4, +0.6, +0.8 mg at 20, 50, 100, 150, 200 g.
std::string calibrated_balance(const plumb::test::ScratchDir& dir) {
  const auto db = plumb::test::calibration_lab(dir).string();
  dir.write("cal.csv", plumb::test::calibration_run_file());
  const auto r = run_plumb({"--db",        db,           "check",        "record",        "BAL-C",     "--procedure",
                            "calibration", "--readings", "cal.csv",      "--temperature", "20C",       "--pressure",
                            "1013.25hPa",  "--humidity", "50%",          "--air-formula", "oiml-r111", "--on",
                            "2026-11-30",  "--as",       "A. Technician"},
                           dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  return db;
}

// SM-02 (0.01 mg) checked on 2026-11-30, then P-07 (fixed 100 uL) with the ten weighings of the worked example.
std::string checked_pipette(const plumb::test::ScratchDir& dir) {
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("sm02.csv", "reading\n100.00003\n100.00004\n100.00002\n100.00003\n100.00005\n100.00003\n100.00002\n"
                        "100.00004\n100.00003\n100.00003\n");
  std::string w = "volume,channel,reading\n";
  for (const char* m : {"0.09971", "0.09965", "0.09980", "0.09958", "0.09992", "0.09975", "0.09969", "0.09983",
                        "0.09961", "0.09977"})
    w += std::string("100uL,1,") + m + "\n";
  dir.write("w.csv", w);
  for (const std::vector<std::string>& step :
       {std::vector<std::string>{"--db", db, "balance", "add", "SM-02", "--capacity", "120g", "--readability", "0.01mg",
                                 "--every", "7d", "--smallest-net", "50mg", "--location", "Weighing room", "--since",
                                 "2026-01-05"},
        std::vector<std::string>{"--db", db, "check", "record", "SM-02", "--weight", "W100", "--readings", "sm02.csv",
                                 "--on", "2026-11-30", "--as", "A. Technician"},
        std::vector<std::string>{"--db", db, "pipette", "add", "P-07", "--nominal", "100uL", "--range", "fixed",
                                 "--every", "3mo", "--location", "Lab 2", "--since", "2026-06-01", "--as",
                                 "Q. Manager"},
        std::vector<std::string>{"--db",        db,           "check",        "record",       "P-07",  "--procedure",
                                 "gravimetric", "--balance",  "SM-02",        "--water-temp", "20C",   "--pressure",
                                 "1013hPa",     "--humidity", "50%",          "--readings",   "w.csv", "--on",
                                 "2026-12-01",  "--as",       "A. Technician"}}) {
    const auto r = run_plumb(step, dir.path());
    INFO(r.err);
    REQUIRE(r.status == 0);
  }
  return db;
}

}  // namespace

TEST_CASE("calibration certificate PDF: tables, chart, budget, rule, on every page its number", "[cli][pdf][calibration]") {
  if (!have_pdftotext()) {
    WARN("pdftotext (poppler-utils) is not installed; scripts/setup installs it. PDF test skipped.");
    return;
  }
  plumb::test::ScratchDir dir;
  const auto db = calibrated_balance(dir);
  auto r = run_plumb({"--db", db, "certificate", "issue", "LAST", "--format", "pdf", "--output", "cal.pdf", "--as",
                      "Q. Manager"},
                     dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const std::string number = json::parse(run_plumb({"--db", db, "certificate", "show", "LAST", "--format", "json"},
                                                   dir.path()).out)["number"];
  CHECK_THAT(number, Catch::StartsWith("CC-"));
  const auto pages = pdf_pages(dir.file("cal.pdf"));
  REQUIRE(pages.size() >= 2);
  check_every_page(pages, number);
  const std::string text = joined(pages);
  CHECK_THAT(text, Catch::Contains("VERDICT: PASS"));
  CHECK_THAT(text, Catch::Contains("Next calibration due: 2027-11-30"));  // 2026-11-30 + 1y
  CHECK_THAT(text, Catch::Contains("does not replace, accredited calibration"));
  // The error of indication table: E at 200 g is 200.0008 - 200 = +0.8 mg, printed with d's decimals plus two
  // guard digits (0.1 mg -> 3 decimals of mg); the MPE at 200 g is 2 e = 2 mg in service (OIML R 76-1 Table 6).
  CHECK_THAT(text, Catch::Contains("+0.800"));
  CHECK_THAT(text, Catch::Contains("\u00b12.000"));
  CHECK_THAT(text, Catch::Contains("Environment and air density"));
  CHECK_THAT(text, Catch::Contains("1.19929"));  // OIML R 111-1 E.3-1 by hand in calibration_test.cpp: 1.199294
  CHECK_THAT(text, Catch::Contains("RC-W200"));  // traceability of every weight
  CHECK_THAT(text, Catch::Contains("Uncertainty budget"));
  CHECK_THAT(text, Catch::Contains("error of indication against load"));  // the chart's title, real text
  CHECK_THAT(text, Catch::Contains("Decision rule"));
}

TEST_CASE("pipette certificate PDF: results table, balance traceability, Z, on every page its number", "[cli][pdf][pipette]") {
  if (!have_pdftotext()) {
    WARN("pdftotext (poppler-utils) is not installed; scripts/setup installs it. PDF test skipped.");
    return;
  }
  plumb::test::ScratchDir dir;
  const auto db = checked_pipette(dir);
  auto r = run_plumb({"--db", db, "certificate", "issue", "LAST", "--format", "pdf", "--output", "pip.pdf", "--as",
                      "Q. Manager"},
                     dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const auto pages = pdf_pages(dir.file("pip.pdf"));
  REQUIRE(!pages.empty());
  check_every_page(pages, "PC-2026-0001");
  const std::string text = joined(pages);
  CHECK_THAT(text, Catch::Contains("VERDICT: PASS"));
  CHECK_THAT(text, Catch::Contains("Next check due: 2027-03-01"));  // 2026-12-01 + 3 months
  CHECK_THAT(text, Catch::Contains("Pipettes checked here may"));
  // Worked by hand in pipette_check_test.cpp: mean 100.01532 uL, e_s +0.01532 uL, s_r 0.1048020 uL, CV 0.10479 %;
  // Z = 1.0028509 uL/mg; limits 0.8 uL and 0.3 uL (ISO 8655-2 Table 1, from memory).
  CHECK_THAT(text, Catch::Contains("100.015"));
  CHECK_THAT(text, Catch::Contains("+0.015"));
  CHECK_THAT(text, Catch::Contains("0.105"));
  CHECK_THAT(text, Catch::Contains("1.0028509"));
  CHECK_THAT(text, Catch::Contains("\u00b10.800 uL"));
  CHECK_THAT(text, Catch::Contains("SM-02"));  // the balance used
  CHECK_THAT(text, Catch::Contains("Limits source"));
}

TEST_CASE("pipette budget: an entered thermometer u is stored, kept by a correction and changes U by hand",
          "[cli][history][pipette][uncertainty]") {
  plumb::test::ScratchDir dir;
  const auto db = checked_pipette(dir);
  // Run 2 is the gravimetric check (run 1 the balance's weekly check). Correct it with u(t) = 0.05 degC entered.
  auto r = run_plumb({"--db", db, "check", "correct", "2", "--water-temp-u", "0.05C", "--reason",
                      "thermometer calibration certificate found", "--as", "Q. Manager"},
                     dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  r = run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json run = json::parse(r.out);
  CHECK_THAT(run["environment"]["water_temperature_u_c"].get<double>(), Catch::Matchers::WithinAbs(0.05, 1e-12));
  CHECK(run["environment"]["air_density_u_kg_m3"].is_null());  // the stated default applied
  r = run_plumb({"--db", db, "history", "P-07", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json j = json::parse(r.out);
  REQUIRE(j["runs"].size() == 2);  // the original stays in history, marked; the correction comes last
  // Terms worked by hand in pipette_check_test.cpp, the temperature's now 0.05 x 99.731 x 0.00020382604
  // = 0.0010163887 uL: U = 2 sqrt(0.0331413184^2 + 0.0028949812^2 + 0.0010163887^2 + 0.0008781170^2
  // + 0.0000421325^2) = 0.0665893028 uL.
  CHECK_THAT(j["runs"][1]["values"]["systematic_error_u_ul"].get<double>(),
             microlitres_near(0.0665893028, ul(0.000000005)));
  // The original keeps the default thermometer's U worked by hand in the test below (0.0667236194 uL).
  CHECK_THAT(j["runs"][0]["values"]["systematic_error_u_ul"].get<double>(),
             microlitres_near(0.0667236194, ul(0.000000005)));
}

TEST_CASE("pipette history quantities: e_s and CV with U, worked by hand", "[cli][history][pipette]") {
  plumb::test::ScratchDir dir;
  const auto db = checked_pipette(dir);
  const auto before = plumb::test::dump_database(db);
  auto r = run_plumb({"--db", db, "history", "P-07", "--format", "json"}, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const json j = json::parse(r.out);
  REQUIRE(j["runs"].size() == 1);
  const json& v = j["runs"][0]["values"];
  // From the worked example (n = 10 deliveries at 100 uL): e_s = +0.01532 uL = +0.01532 % of 100 uL,
  // s_r = 0.1048020 uL, CV = 0.10479 %.
  //   U(e_s) from the run's ISO 8655-6 budget, terms worked by hand in pipette_check_test.cpp (no balance
  //   calibration u is known here, default thermometer and air density u, no evaporation):
  //   2 sqrt(0.0331413184^2 + 0.0028949812^2 + 0.0023472493^2 + 0.0008781170^2 + 0.0000421325^2)
  //   = 0.0667236194 uL; in % of 100 uL: 0.0667236194 %
  //   U(CV) = 2 CV / sqrt(2 (n - 1)) = 2 x 0.10479 / sqrt(18) = 0.20958 / 4.2426407 = 0.049398 %
  // Margins: half a unit in the last digit worked by hand.
  CHECK_THAT(v["systematic_error_ul"].get<double>(), microlitres_near(0.01532, ul(0.000005)));
  CHECK_THAT(v["systematic_error_u_ul"].get<double>(), microlitres_near(0.0667236194, ul(0.000000005)));
  CHECK_THAT(v["relative_systematic_error_pct"].get<double>(), percent_near(0.01532, pp(0.000005)));
  CHECK_THAT(v["relative_systematic_error_u_pct"].get<double>(), percent_near(0.0667236194, pp(0.000000005)));
  CHECK_THAT(v["cv_pct"].get<double>(), percent_near(0.10479, pp(0.000005)));
  CHECK_THAT(v["cv_u_pct"].get<double>(), percent_near(0.049398, pp(0.000002)));
  // Tolerances from the stored limits: 0.8 uL = 0.8 % of 100 uL for e_s, CV <= 0.3 % (s_r 0.3 uL).
  bool saw_cv = false;
  for (const auto& c : j["columns"]) {
    if (c["key"] == "systematic-error") {
      CHECK_THAT(c["tolerance"]["lower_ul"].get<double>(), microlitres_near(-0.8, ul(1e-9)));
      CHECK_THAT(c["tolerance"]["upper_ul"].get<double>(), microlitres_near(0.8, ul(1e-9)));
      CHECK_THAT(c["label"].get<std::string>(), Catch::Contains("100 uL"));
    }
    if (c["key"] == "cv") {
      saw_cv = true;
      CHECK(c["tolerance"]["lower_pct"].is_null());
      CHECK_THAT(c["tolerance"]["upper_pct"].get<double>(), percent_near(0.3, pp(1e-9)));
    }
  }
  CHECK(saw_cv);

  // A named test volume and channel read the same point; one that was not tested has no value to chart.
  r = run_plumb({"--db", db, "history", "P-07", "--quantity", "cv@100uL/ch1", "--chart", "cv.svg"}, dir.path());
  INFO(r.err);
  CHECK(r.status == 0);
  r = run_plumb({"--db", db, "history", "P-07", "--quantity", "cv@50uL", "--chart", "cv50.svg"}, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err,
             Catch::Contains("no check of pipette P-07 has a result there") && Catch::Contains("tested: 100 uL"));
  r = run_plumb({"--db", db, "history", "P-07", "--quantity", "cv@ten"}, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("--quantity \"cv@ten\"") && Catch::Contains("not a volume with its unit"));
  r = run_plumb({"--db", db, "history", "P-07", "--quantity", "bias"}, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("relative-systematic-error"));
  CHECK(plumb::test::dump_database(db) == before);  // read-only
}
