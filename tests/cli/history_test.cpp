// End to end: history, control chart, drift, interval review, PDF certificate and HTML report through the
// built binary, on a history built by hand so that every expected value is worked out below.
//
// The hand-built history (balance BAL-L, d = 0.1 mg, lab limit |bias| <= 0.5 mg; weight W100 with
// conventional mass 100.00003 g, U = 0.05 mg, k = 2): five weekly checks from 2026-03-02 (the date W100 was
// calibrated), check i (i = 0..4) has five readings a_i and five a_i + 0.0001 g with a_i = 100.0000 + 0.0001 i g. So
//   mean_i = a_i + 0.00005 g, bias_i = mean_i - 100.00003 = 0.02 + 0.1 i mg (0.02, 0.12, 0.22, 0.32, 0.42),
//   s = 0.05 mg * sqrt(10/9) = 0.0527046 mg for every check.
// U of the bias (k = 2): u^2 = s^2/n + (U_w/k)^2 + d^2/12 = 0.000277778 + 0.000625 + 0.000833333
//   = 0.00173611 mg^2 (exactly 1/576), u = 0.0416667 mg, U = 0.0833333 mg (1/12).
// U of the SD: 2 s / sqrt(2 (n - 1)) = 2 * 0.0527046 / sqrt(18) = 0.0248452 mg (0.02484519975).
// Drift: bias = 0.02 + (0.1/7) d mg exactly (d in days since 2026-03-02), R^2 = 1. The lab limit 0.5 mg is
//   reached at d = (0.5 - 0.02) * 70 = 33.6, i.e. on day 34 = 2026-04-05: after the last check (day 28),
//   so extrapolation, and before the horizon (day 56).
// Control chart with --baseline 3: centre 0.12 mg, moving ranges 0.1, sigma = 0.1 / 1.128 = 0.0886525 mg,
//   UCL = 0.12 + 0.265957 = 0.385957 mg: check 5 (0.42 mg, 2026-03-30) lies beyond it (rule 1).
// Masses below are compared within 1e-6 ug (1e-9 mg), far below d = 0.1 mg and above the rounding of doubles.
#include <catch2/catch.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cstdio>
#include <fstream>
#include <nlohmann/json.hpp>
#include <set>
#include <sstream>

#include "support/margin.hpp"
#include "support/run_plumb.hpp"
#include "support/xml_scan.hpp"

using nlohmann::json;
using plumb::test::milligrams_near;
using plumb::test::run_plumb;
using plumb::test::ug;
using plumb::test::xml_elements;

namespace {

std::string readings(int i, int pairs = 5) {
  std::string csv = "reading\n";
  const int base = i;  // a_i in units of 0.1 mg above 100 g
  for (int k = 0; k < pairs; ++k) csv += fmt::format("100.{:04d}\n100.{:04d}\n", base, base + 1);
  return csv;
}

std::string slurp(const std::filesystem::path& p) {
  std::ifstream f(p, std::ios::binary);
  std::stringstream s;
  s << f.rdbuf();
  return s.str();
}

std::string pdftotext(const std::filesystem::path& pdf) {
  const std::string cmd = "pdftotext -layout '" + pdf.string() + "' - 2>/dev/null";
  std::string out;
  if (FILE* p = popen(cmd.c_str(), "r")) {
    char buf[4096];
    std::size_t n;
    while ((n = fread(buf, 1, sizeof buf, p)) > 0) out.append(buf, n);
    pclose(p);
  }
  return out;
}

/// The example lab plus BAL-L (lab limit 0.5 mg) with the five hand-built checks.
std::string hand_built_lab(const plumb::test::ScratchDir& dir) {
  const auto db = plumb::test::example_lab(dir).string();
  auto r = run_plumb({"--db", db, "balance", "add", "BAL-L", "--capacity", "220g", "--readability", "0.1mg", "--every",
                      "7d", "--max-bias", "0.5mg", "--location", "Room 3", "--since", "2026-03-02"},
                     dir.path());
  REQUIRE(r.status == 0);
  const char* dates[] = {"2026-03-02", "2026-03-09", "2026-03-16", "2026-03-23", "2026-03-30"};
  for (int i = 0; i < 5; ++i) {
    dir.write("r.csv", readings(i));
    r = run_plumb({"--db", db, "check", "record", "BAL-L", "--procedure", "repeatability", "--weight", "W100",
                   "--readings", "r.csv", "--on", dates[i], "--as", "A. Technician"},
                  dir.path());
    REQUIRE(r.status == 0);
  }
  return db;
}

}  // namespace

TEST_CASE("history lists every run with bias, SD and their U worked by hand", "[cli][history]") {
  plumb::test::ScratchDir dir;
  const auto db = hand_built_lab(dir);
  const auto before = plumb::test::dump_database(db);
  auto r = run_plumb({"--db", db, "history", "BAL-L", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json j = json::parse(r.out);
  REQUIRE(j["runs"].size() == 5);
  for (int i = 0; i < 5; ++i) {
    const auto& v = j["runs"][i]["values"];
    CHECK_THAT(v["bias_mg"].get<double>(), milligrams_near(0.02 + 0.1 * i, ug(1e-6)));
    CHECK_THAT(v["bias_u_mg"].get<double>(), milligrams_near(1.0 / 12.0, ug(1e-6)));
    CHECK_THAT(v["sd_mg"].get<double>(), milligrams_near(0.052704627669, ug(1e-6)));
    CHECK_THAT(v["sd_u_mg"].get<double>(), milligrams_near(0.02484519975, ug(1e-6)));
  }
  CHECK_THAT(j["columns"][0]["tolerance"]["upper_mg"].get<double>(), milligrams_near(0.5, ug(1e-6)));

  r = run_plumb({"--db", db, "history", "BAL-L", "--format", "csv", "--from", "2026-03-09", "--to", "2026-03-16"},
                dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::StartsWith("run_id,date,procedure,operator,verdict,next_due,supersedes,superseded_by,"
                                      "bias_mg,bias_u_mg"));
  CHECK(std::count(r.out.begin(), r.out.end(), '\n') == 3);  // header + the two checks in the period
  CHECK_THAT(r.out, Catch::Contains("\n2,2026-03-09,") && Catch::Contains("\n3,2026-03-16,") &&
                        !Catch::Contains("2026-03-23,repeatability"));
  // Read-only: nothing written.
  CHECK(plumb::test::dump_database(db) == before);
}

TEST_CASE("history --quantity shows that quantity only, in text, CSV and JSON", "[cli][history]") {
  plumb::test::ScratchDir dir;
  const auto db = hand_built_lab(dir);
  auto r = run_plumb({"--db", db, "history", "BAL-L", "--quantity", "sd", "--format", "csv"}, dir.path());
  REQUIRE(r.status == 0);
  // The same SD worked by hand as above (0.052704627669 mg), and no other quantity's columns.
  CHECK_THAT(r.out, Catch::StartsWith("run_id,date,procedure,operator,verdict,next_due,supersedes,superseded_by,"
                                      "sd_mg,sd_u_mg\n"));
  CHECK_THAT(r.out, !Catch::Contains("bias_mg") && Catch::Contains(",0.05270462767,"));
  r = run_plumb({"--db", db, "history", "BAL-L", "--quantity", "sd"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("sd (mg)") && !Catch::Contains("bias (mg)") && !Catch::Contains("min-weight"));
  r = run_plumb({"--db", db, "history", "BAL-L", "--quantity", "bias", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json j = json::parse(r.out);
  REQUIRE(j["columns"].size() == 1);
  CHECK(j["columns"][0]["key"] == "bias");
  CHECK(!j["runs"][0]["values"].contains("sd_mg"));
  // Without --quantity every quantity of a balance is a column, as before.
  r = run_plumb({"--db", db, "history", "BAL-L", "--format", "csv"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("bias_mg") && Catch::Contains("sd_mg") && Catch::Contains("min_weight_mg"));
}

TEST_CASE("drift of the hand-built history: line, R^2 = 1 and an extrapolated date", "[cli][history][drift]") {
  plumb::test::ScratchDir dir;
  const auto db = hand_built_lab(dir);
  auto r = run_plumb({"--db", db, "drift", "BAL-L", "--quantity", "bias", "--format", "json", "--chart", "drift.svg"},
                     dir.path());
  REQUIRE(r.status == 0);
  const json j = json::parse(r.out);
  CHECK(j["slope_per_day_mg"].get<double>() == Approx(0.1 / 7).epsilon(1e-9));
  CHECK(j["r_squared"].get<double>() == Approx(1.0).margin(1e-9).epsilon(0));
  CHECK_THAT(j["intercept_mg"].get<double>(), milligrams_near(0.02, ug(1e-6)));
  CHECK(j["status"] == "reaches_limit");
  CHECK(j["reached"]["date"] == "2026-04-05");
  CHECK(j["reached"]["extent"] == "extrapolation");
  CHECK(j["horizon"] == "2026-04-27");  // last check 2026-03-30 + the 28-day span

  // The chart, read from the renderer's record in the SVG.
  const std::string svg = slurp(dir.file("drift.svg"));
  CHECK_THAT(xml_elements(svg, "title").at(0).text, Catch::Contains("BAL-L") && Catch::Contains("Bias at 100 g"));
  std::set<std::string> texts;
  for (const auto& e : xml_elements(svg, "text")) texts.insert(e.attr("role") + ": " + e.text);
  CHECK(texts.count("x-axis-label: Date of check") == 1);
  CHECK(texts.count("y-axis-label: Bias at 100 g (mg)") == 1);
  CHECK(xml_elements(svg, "point").size() == 5);
  CHECK(xml_elements(svg, "error-bar").size() == 5);
  const auto limits = xml_elements(svg, "tolerance-limit");
  REQUIRE(limits.size() == 2);
  CHECK(limits[0].attr("value") == "-0.5");
  CHECK(limits[1].attr("value") == "0.5");
  bool trend_label = false;
  for (const auto& e : xml_elements(svg, "text"))
    if (e.attr("role") == "trend-label")
      trend_label = e.text.find("R\u00b2 = 1.0000") != std::string::npos &&
                    e.text.find("2026-04-05 (extrapolation)") != std::string::npos;
  CHECK(trend_label);
  CHECK(xml_elements(svg, "extrapolated").size() == 1);
  bool u_stated = false;
  for (const auto& e : xml_elements(svg, "text"))
    if (e.attr("role") == "note" && e.text.find("U (k = 2) of the bias") != std::string::npos) u_stated = true;
  CHECK(u_stated);
}

TEST_CASE("control chart with a chosen baseline flags the check beyond 3 sigma", "[cli][history][control]") {
  plumb::test::ScratchDir dir;
  const auto db = hand_built_lab(dir);
  auto r = run_plumb({"--db", db, "control-chart", "BAL-L", "--quantity", "bias", "--baseline", "3", "--format",
                      "json"},
                     dir.path());
  REQUIRE(r.status == 0);
  const json j = json::parse(r.out);
  CHECK_THAT(j["centre_mg"].get<double>(), milligrams_near(0.12, ug(1e-6)));
  CHECK_THAT(j["sigma_mg"].get<double>(), milligrams_near(0.088652482270, ug(1e-6)));  // 0.1 / 1.128
  CHECK_THAT(j["ucl_mg"].get<double>(), milligrams_near(0.385957446809, ug(1e-6)));
  bool rule1 = false;
  for (const auto& f : j["flags"])
    if (f["rule"] == 1 && f["run_ids"].size() == 1 && f["dates"][0] == "2026-03-30") rule1 = true;
  CHECK(rule1);
  r = run_plumb({"--db", db, "control-chart", "BAL-L", "--baseline", "3"}, dir.path());
  CHECK_THAT(r.out, Catch::Contains("Western Electric rule 1"));

  r = run_plumb({"--db", db, "interval-review", "BAL-L"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("method 1") && Catch::Contains("control-chart method") &&
                        Catch::Contains("RECOMMENDATION"));
}

TEST_CASE("PDF certificate: number on every page, verdict, due date, caution", "[cli][pdf]") {
  if (std::system("pdftotext -v >/dev/null 2>&1") != 0) {
    WARN("pdftotext (poppler-utils) is not installed; scripts/setup installs it. PDF test skipped.");
    return;
  }
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("long.csv", readings(2, 100));  // 200 readings: the readings table runs onto a second page
  auto r = run_plumb({"--db", db, "check", "record", "BAL-A", "--procedure", "repeatability", "--weight", "W100",
                      "--readings", "long.csv", "--on", "2026-11-30", "--as", "A. Technician"},
                     dir.path());
  REQUIRE(r.status == 0);
  r = run_plumb({"--db", db, "certificate", "issue", "LAST", "--format", "pdf", "--output", "cert.pdf", "--as",
                 "Q. Manager"},
                dir.path());
  REQUIRE(r.status == 0);
  const std::string text = pdftotext(dir.file("cert.pdf"));
  std::vector<std::string> pages;
  std::stringstream ss(text);
  for (std::string page; std::getline(ss, page, '\f');)
    if (page.find_first_not_of(" \n") != std::string::npos) pages.push_back(page);
  REQUIRE(pages.size() >= 2);
  for (std::size_t i = 0; i < pages.size(); ++i) {
    INFO("page " << i + 1);
    CHECK_THAT(pages[i], Catch::Contains("BC-2026-0001"));
    CHECK_THAT(pages[i], Catch::Contains(fmt::format("page {} of {}", i + 1, pages.size())));
  }
  CHECK_THAT(text, Catch::Contains("VERDICT: PASS"));
  CHECK_THAT(text, Catch::Contains("Next check due: 2026-12-07"));  // 2026-11-30 + 7 d
  CHECK_THAT(text, Catch::Contains("does not replace, accredited calibration"));
  CHECK_THAT(text, Catch::Contains("Example Analytical Lab"));
  CHECK_THAT(text, Catch::Contains("200 readings"));

  // show renders the same stored certificate.
  r = run_plumb({"--db", db, "certificate", "show", "BC-2026-0001", "--format", "pdf", "--output", "again.pdf"},
                dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(pdftotext(dir.file("again.pdf")), Catch::Contains("VERDICT: PASS"));
}

namespace {

// The hrefs of an HTML page's links, unescaped (the report writes them with &amp; where needed).
std::vector<std::string> links_of(const std::string& html) {
  std::vector<std::string> out;
  for (auto p = html.find("<a href=\""); p != std::string::npos; p = html.find("<a href=\"", p + 1)) {
    const auto q = html.find('"', p + 9);
    out.push_back(plumb::test::xml_unescape(html.substr(p + 9, q - p - 9)));
  }
  return out;
}

// A page is self-contained: nothing fetched, no script, ids unique within it. The one address allowed is the SVG
// namespace name, which is a name, never fetched.
void check_self_contained(std::string html) {
  const std::string svg_namespace = "xmlns=\"http://www.w3.org/2000/svg\"";
  for (auto p = html.find(svg_namespace); p != std::string::npos; p = html.find(svg_namespace, p))
    html.erase(p, svg_namespace.size());
  CHECK(html.find("http://") == std::string::npos);
  CHECK(html.find("https://") == std::string::npos);
  CHECK(html.find("<script") == std::string::npos);
  std::set<std::string> ids;
  for (auto p = html.find(" id=\""); p != std::string::npos; p = html.find(" id=\"", p + 1)) {
    const auto q = html.find('"', p + 5);
    const std::string id = html.substr(p + 5, q - p - 5);
    INFO(id);
    CHECK(ids.insert(id).second);
  }
}

unsigned mode_of(const std::filesystem::path& p) {
  return static_cast<unsigned>(std::filesystem::status(p).permissions() & std::filesystem::perms::all);
}

}  // namespace

TEST_CASE("HTML report: an overview that links one self-contained page per instrument, owner-only", "[cli][html]") {
  plumb::test::ScratchDir dir;
  const auto db = hand_built_lab(dir);
  const auto before = plumb::test::dump_database(db);
  auto r = run_plumb({"--db", db, "report", "--html", "lab.html", "--on", "2026-03-31"}, dir.path());
  REQUIRE(r.status == 0);
  const std::string overview = slurp(dir.file("lab.html"));
  check_self_contained(overview);
  CHECK_THAT(overview, Catch::Contains("Example Analytical Lab") && Catch::Contains("the whole laboratory"));
  CHECK(overview.find("<svg") == std::string::npos);  // charts are on the instrument pages
  // Every instrument of the lab has one row, and its link names an existing page holding that instrument.
  const auto ids = json::parse(run_plumb({"--db", db, "balance", "list", "--format", "json"}, dir.path()).out);
  const auto links = links_of(overview);
  std::size_t instruments = 0;
  for (const auto& b : ids) {
    const std::string id = b["id"].get<std::string>();
    ++instruments;
    const auto link = std::find_if(links.begin(), links.end(), [&](const std::string& l) {
      return l.find("lab-instruments/") == 0 && l.size() > id.size() + 5 &&
             l.compare(l.size() - id.size() - 5, id.size() + 5, id + ".html") == 0;
    });
    INFO(id);
    REQUIRE(link != links.end());
    const auto page_path = dir.file(*link);
    REQUIRE(std::filesystem::is_regular_file(page_path));
    CHECK(mode_of(page_path) == 0600U);
    const std::string page = slurp(page_path);
    check_self_contained(page);
    CHECK_THAT(page, Catch::Contains("<h2 id=\"" + id + "\">"));
    CHECK_THAT(page, Catch::Contains("<a href=\"../lab.html\">"));  // back to the overview
  }
  CHECK(links.size() == instruments);
  CHECK(mode_of(dir.file("lab.html")) == 0600U);
  CHECK(mode_of(dir.file("lab-instruments")) == 0700U);
  // BAL-L has five checks: its page carries its charts inline, their text as text (no glyph outlines).
  const auto bal_l = std::find_if(links.begin(), links.end(), [](const std::string& l) {
    return l.size() > 10 && l.compare(l.size() - 10, 10, "BAL-L.html") == 0;
  });
  REQUIRE(bal_l != links.end());
  const std::string page = slurp(dir.file(*bal_l));
  CHECK(plumb::test::count_of(page, "<svg xmlns") >= 2);
  CHECK_THAT(page, Catch::Contains("<text class=\"x-axis-label\"") && Catch::Contains(">Date of check</tspan>"));
  CHECK(page.find("<symbol") == std::string::npos);
  CHECK(page.find("<use") == std::string::npos);
  CHECK(plumb::test::dump_database(db) == before);  // read-only

  r = run_plumb({"--db", db, "report", "--html", "one.html", "--instrument", "BAL-L"}, dir.path());
  REQUIRE(r.status == 0);
  const std::string one = slurp(dir.file("one.html"));
  CHECK_THAT(one, Catch::Contains("instrument BAL-L") && Catch::Contains("Status and due list"));
  CHECK(!std::filesystem::exists(dir.file("one-instruments")));  // one instrument: one page
  CHECK(mode_of(dir.file("one.html")) == 0600U);
}

TEST_CASE("HTML report that fails part-way leaves no file of its own behind", "[cli][html][errors]") {
  plumb::test::ScratchDir dir;
  const auto db = hand_built_lab(dir);
  // A folder where the first instrument's page must go: renaming the finished page onto it fails.
  const auto ids = json::parse(run_plumb({"--db", db, "balance", "list", "--format", "json"}, dir.path()).out);
  REQUIRE(!ids.empty());
  const std::string first = ids[0]["id"].get<std::string>();
  const auto blocked = dir.file("lab-instruments") / ("0001-" + first + ".html");
  std::filesystem::create_directories(blocked);
  auto r = run_plumb({"--db", db, "report", "--html", "lab.html", "--on", "2026-03-31"}, dir.path());
  CHECK(r.status == 3);
  CHECK_THAT(r.err, Catch::Contains("cannot write the report file") && Catch::Contains("0001-" + first + ".html"));
  CHECK(!std::filesystem::exists(dir.file("lab.html")));
  // The folder was there before, so it stays; nothing of the failed report is left in it.
  std::size_t left = 0;
  for (const auto& e : std::filesystem::directory_iterator(dir.file("lab-instruments"))) left += e.path() != blocked;
  CHECK(left == 0);

  // Without the obstacle the same command succeeds.
  std::filesystem::remove_all(dir.file("lab-instruments"));
  r = run_plumb({"--db", db, "report", "--html", "lab.html", "--on", "2026-03-31"}, dir.path());
  CHECK(r.status == 0);
}
