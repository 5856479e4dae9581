// One document, many renderings: for every kind of certificate (a weekly check, a calibration, a pipette check)
// and every standing (a replacement, an approved one, a superseded one, a withdrawn one, a draft), every labelled
// value of the certificate's document (the "rendering" list of its JSON) appears in its text, its HTML and the
// text of its PDF (poppler's pdftotext), and its identification, people and standing appear in its DCC.
//
// Whitespace is ignored in the comparison: the PDF wraps a long value inside its table cell or column and the
// text wraps a paragraph at 78 columns, and neither changes what the value says.
#include <catch2/catch.hpp>

#include <cstdio>
#include <nlohmann/json.hpp>
#include <regex>

#include "support/rendered_text.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::run_plumb;

using plumb::test::have_pdftotext;
using plumb::test::html_text;
using plumb::test::pdf_text;
using plumb::test::without_spaces;

namespace {

void ok(const plumb::test::RunResult& r) {
  INFO(r.err);
  REQUIRE(r.status == 0);
}

// The lab of tests/support calibration_lab (BAL-C, class I, E2 weights W20 to W200) with a weekly check of BAL-C,
// its correction (the replacement, then approved by a third person), a calibration of BAL-C left as a draft, and a
// pipette check on SM-02 whose run is voided (its certificate withdrawn).
std::string lab_with_every_kind(const plumb::test::ScratchDir& dir) {
  const auto db = plumb::test::calibration_lab(dir).string();
  dir.write("wk.csv",
            "reading\n100.0003\n100.0004\n100.0002\n100.0003\n100.0005\n100.0003\n100.0002\n100.0004\n"
            "100.0003\n100.0003\n");
  dir.write("wk2.csv",
            "reading\n100.0003\n100.0004\n100.0002\n100.0003\n100.0004\n100.0003\n100.0002\n100.0004\n"
            "100.0003\n100.0003\n");
  dir.write("cal.csv", plumb::test::calibration_run_file());
  dir.write("sm.csv",
            "reading\n100.00003\n100.00004\n100.00002\n100.00003\n100.00005\n100.00003\n100.00002\n"
            "100.00004\n100.00003\n100.00003\n");
  std::string w = "volume,channel,reading\n";
  for (const char* m :
       {"0.09971", "0.09965", "0.09980", "0.09958", "0.09992", "0.09975", "0.09969", "0.09983", "0.09961", "0.09977"})
    w += std::string("100uL,1,") + m + "\n";
  dir.write("w.csv", w);
  const std::vector<std::vector<std::string>> steps = {
      {"instrument", "update", "BAL-C", "--maker", "Northfield", "--model", "AX-220", "--serial", "NF-0042", "--from",
       "2026-01-05", "--reason", "identification from the rating plate", "--as", "Q. Manager"},
      {"check", "record", "BAL-C", "--weight", "W100", "--readings", "wk.csv", "--on", "2026-11-30", "--as",
       "A. Technician"},
      {"certificate", "issue", "LAST", "--as", "A. Technician"},
      {"certificate", "approve", "LAST", "--meaning", "reviewed and approved", "--as", "Q. Manager"},
      {"check", "correct", "1", "--readings", "wk2.csv", "--reason", "reading 5 mistyped on the first entry", "--as",
       "Q. Manager"},
      {"certificate", "approve", "LAST", "--meaning", "reviewed and approved", "--as", "R. Reviewer"},
      {"check", "record", "BAL-C", "--procedure", "calibration", "--readings", "cal.csv", "--temperature", "20C",
       "--pressure", "1013.25hPa", "--humidity", "50%", "--on", "2026-11-30", "--as", "A. Technician"},
      {"certificate", "issue", "LAST", "--as", "Q. Manager"},
      {"balance", "add", "SM-02", "--capacity", "120g", "--readability", "0.01mg", "--every", "7d", "--smallest-net",
       "50mg", "--location", "Weighing room", "--since", "2026-01-05"},
      {"check", "record", "SM-02", "--weight", "W100", "--readings", "sm.csv", "--on", "2026-11-30", "--as",
       "A. Technician"},
      {"pipette", "add", "P-07", "--nominal", "100uL", "--range", "fixed", "--every", "3mo", "--location", "Lab 2",
       "--since", "2026-06-01", "--serial", "PX-7781"},
      {"check", "record", "P-07", "--procedure", "gravimetric", "--balance", "SM-02", "--water-temp", "20C",
       "--pressure", "1013hPa", "--humidity", "50%", "--readings", "w.csv", "--on", "2026-12-01", "--as",
       "A. Technician"},
      {"certificate", "issue", "LAST", "--as", "Q. Manager"},
      {"check", "void", "LAST", "--reason", "water temperature probe found broken", "--as", "Q. Manager"}};
  for (auto step : steps) {
    step.insert(step.begin(), {"--db", db});
    INFO(step[2] << " " << step[3]);
    ok(run_plumb(step, dir.path()));
  }
  return db;
}

struct Renderings {
  json document;  // the JSON rendering
  std::string text, html, pdf, dcc;
};

Renderings renderings_of(const std::string& db, const std::string& number, const plumb::test::ScratchDir& dir) {
  Renderings r;
  auto out = run_plumb({"--db", db, "certificate", "show", number, "--format", "json"}, dir.path());
  ok(out);
  r.document = json::parse(out.out);
  out = run_plumb({"--db", db, "certificate", "show", number}, dir.path());
  ok(out);
  r.text = out.out;
  out = run_plumb({"--db", db, "certificate", "show", number, "--format", "html"}, dir.path());
  ok(out);
  r.html = html_text(out.out);
  const std::string pdf = number + ".pdf";
  ok(run_plumb({"--db", db, "certificate", "show", number, "--format", "pdf", "--output", pdf}, dir.path()));
  r.pdf = pdf_text(dir.file(pdf));
  out = run_plumb({"--db", db, "certificate", "show", number, "--format", "dcc", "--country", "SE"}, dir.path());
  ok(out);
  r.dcc = out.out;
  return r;
}

std::string value_of(const json& rendering, const std::string& label) {
  for (const auto& v : rendering)
    if (v["label"] == label) return v["value"];
  return "";
}

void every_value_everywhere(const Renderings& r) {
  const json& values = r.document.at("rendering");
  REQUIRE(values.size() > 40);  // a certificate says far more than this; fewer means sections went missing
  const std::string text = without_spaces(r.text), html = without_spaces(r.html), pdf = without_spaces(r.pdf);
  int checked = 0;
  for (const auto& v : values) {
    const std::string value = without_spaces(v["value"].get<std::string>());
    INFO(v["section"].get<std::string>() << " / " << v["label"].get<std::string>() << ": "
                                         << v["value"].get<std::string>());
    CHECK(text.find(value) != std::string::npos);
    CHECK(html.find(value) != std::string::npos);
    CHECK(pdf.find(value) != std::string::npos);
    ++checked;
  }
  CHECK(checked == static_cast<int>(values.size()));
}

// The identification, the people and the standing in the DCC (its results are SI values: tests/cli/dcc_*).
void identity_in_dcc(const Renderings& r) {
  const json& doc = r.document;
  CHECK_THAT(r.dcc,
             Catch::Contains("<dcc:uniqueIdentifier>" + doc["number"].get<std::string>() + "</dcc:uniqueIdentifier>"));
  CHECK_THAT(r.dcc, Catch::Contains(doc["lab"]["name"].get<std::string>()));
  CHECK_THAT(r.dcc, Catch::Contains(doc["instrument"]["id"].get<std::string>()));
  if (doc["instrument"].contains("serial") && doc["instrument"]["serial"].is_string() &&
      !doc["instrument"]["serial"].get<std::string>().empty())
    CHECK_THAT(r.dcc, Catch::Contains(doc["instrument"]["serial"].get<std::string>()));
  CHECK_THAT(r.dcc, Catch::Contains(doc["check"]["operator"].get<std::string>()));
  const json& status = doc["status"];
  if (status["approval"].is_object()) CHECK_THAT(r.dcc, Catch::Contains(status["approval"]["by"].get<std::string>()));
  const std::string state = status["state"];
  if (state == "draft") CHECK_THAT(r.dcc, Catch::Contains("DRAFT"));
  if (state == "withdrawn") CHECK_THAT(r.dcc, Catch::Contains("WITHDRAWN"));
  if (state == "superseded") CHECK_THAT(r.dcc, Catch::Contains("SUPERSEDED"));
}

}  // namespace

TEST_CASE("every labelled value of each certificate appears in its text, HTML and PDF, and its identity in its DCC",
          "[cli][certificate][parity][pdf]") {
  if (!have_pdftotext()) {
    WARN("pdftotext (poppler-utils) is not installed; scripts/setup installs it. Parity test skipped.");
    return;
  }
  plumb::test::ScratchDir dir;
  const auto db = lab_with_every_kind(dir);
  // BC-2026-0001 superseded (it was approved first), BC-2026-0002 its replacement, approved; CC-2026-0001 a draft
  // calibration; PC-2026-0001 a pipette check, withdrawn.
  for (const auto& [number, state] : std::vector<std::pair<std::string, std::string>>{{"BC-2026-0001", "superseded"},
                                                                                      {"BC-2026-0002", "approved"},
                                                                                      {"CC-2026-0001", "draft"},
                                                                                      {"PC-2026-0001", "withdrawn"}}) {
    INFO(number);
    const Renderings r = renderings_of(db, number, dir);
    REQUIRE(r.document["status"]["state"] == state);
    every_value_everywhere(r);
    identity_in_dcc(r);
    const json& values = r.document["rendering"];
    // What the JSON record holds is what its document says.
    CHECK(value_of(values, "Certificate No.") == r.document["number"]);
    CHECK(value_of(values, "Instrument") == r.document["instrument"]["id"]);
    // ISO/IEC 17025 7.8.2.1: customer, item identification, the statement on the item, and (below) the mark.
    CHECK_THAT(value_of(values, "Customer"), Catch::Contains("Example Calibration Lab"));
    CHECK_THAT(r.text, Catch::Contains("The results relate only to the item identified above"));
    const std::string mark = state == "approved"    ? ""
                             : state == "draft"     ? "DRAFT"
                             : state == "withdrawn" ? "WITHDRAWN"
                                                    : "SUPERSEDED";
    CHECK(value_of(values, "Mark") == mark);
    if (!mark.empty()) {
      CHECK_THAT(r.text, Catch::StartsWith("*** " + mark + " ***"));
      CHECK_THAT(r.html, Catch::Contains(mark));
    } else {
      CHECK_THAT(r.text, !Catch::Contains("*** "));
    }
  }
}

TEST_CASE("a draft, withdrawn or superseded certificate is marked on every PDF page, an approved one on none",
          "[cli][certificate][parity][pdf]") {
  if (!have_pdftotext()) {
    WARN("pdftotext (poppler-utils) is not installed; scripts/setup installs it. PDF test skipped.");
    return;
  }
  plumb::test::ScratchDir dir;
  const auto db = lab_with_every_kind(dir);
  for (const auto& [number, mark] : std::vector<std::pair<std::string, std::string>>{{"BC-2026-0001", "SUPERSEDED"},
                                                                                     {"BC-2026-0002", ""},
                                                                                     {"CC-2026-0001", "DRAFT"},
                                                                                     {"PC-2026-0001", "WITHDRAWN"}}) {
    INFO(number);
    const std::string pdf = number + "-marks.pdf";
    ok(run_plumb({"--db", db, "certificate", "show", number, "--format", "pdf", "--output", pdf}, dir.path()));
    std::string all = pdf_text(dir.file(pdf));
    std::vector<std::string> pages;
    for (std::size_t from = 0, ff = all.find('\f'); from < all.size();
         from = ff == std::string::npos ? all.size() : ff + 1, ff = all.find('\f', from))
      if (const auto page = all.substr(from, ff == std::string::npos ? std::string::npos : ff - from);
          page.find_first_not_of(" \n") != std::string::npos)
        pages.push_back(page);
    REQUIRE(!pages.empty());
    for (std::size_t i = 0; i < pages.size(); ++i) {
      INFO("page " << i + 1 << " of " << pages.size());
      CHECK_THAT(pages[i], Catch::Contains(number));
      CHECK_THAT(pages[i], Catch::Contains("page " + std::to_string(i + 1) + " of " + std::to_string(pages.size())));
      // The mark is drawn diagonally across the page; pdftotext reads such text one letter to a line.
      const auto diagonal = [](const std::string& word) {
        std::string re = "(^|\n)";
        for (char c : word) re += std::string(1, c) + "\n";
        return std::regex(re);
      };
      for (const std::string m : {"DRAFT", "WITHDRAWN", "SUPERSEDED"}) {
        INFO(m);
        CHECK(std::regex_search(pages[i], diagonal(m)) == (m == mark));
      }
    }
  }
}
