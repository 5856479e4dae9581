// What a user sees names each standard and its edition and never apologises for how a table came into plumb:
// the demo lab and its main outputs (run text and JSON, certificates as text, JSON and PDF, history with its
// chart, the HTML report, due list, summary, registries, the audit log) are searched for the words that once
// appeared there. The project's docs, not its outputs, say which tables were transcribed and how they were checked.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cctype>
#include <cstdlib>
#include <fstream>
#include <iterator>
#include <nlohmann/json.hpp>

#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::run_plumb;
using plumb::test::ScratchDir;

namespace {

std::string lower(std::string s) {
  std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  return s;
}

std::string read_file(const std::filesystem::path& p) {
  std::ifstream in(p, std::ios::binary);
  return {std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
}

void no_apology(const std::string& where, const std::string& text) {
  INFO(where);
  REQUIRE_FALSE(text.empty());
  const std::string t = lower(text);
  for (const char* word : {"from memory", "as remembered", "remembered", "transcribed", "recalled"}) {
    INFO("word: " << word);
    CHECK(t.find(word) == std::string::npos);
  }
}

std::string output(const ScratchDir& dir, const std::vector<std::string>& args) {
  const auto r = run_plumb(args, dir.path());
  INFO("plumb " << args.back() << ": " << r.err);
  REQUIRE(r.status == 0);
  return r.out + r.err;
}

}  // namespace

TEST_CASE("no output of the demo lab says \"from memory\", \"as remembered\" or \"transcribed\"", "[cli][wording]") {
  ScratchDir dir;
  const auto demo = run_plumb({"demo"}, dir.path());
  REQUIRE(demo.status == 0);
  no_apology("demo", demo.out + demo.err);
  const std::string db = dir.file("plumb-demo.db").string();
  no_apology("demo HTML report", read_file(dir.file("plumb-demo.db.report.html")));

  const std::string pdf_text = dir.file("demo.txt").string();
  REQUIRE(std::system(
              ("pdftotext '" + dir.file("plumb-demo.db.certificate.pdf").string() + "' '" + pdf_text + "'").c_str()) ==
          0);
  no_apology("demo certificate PDF", read_file(pdf_text));

  for (const std::vector<std::string>& args : {std::vector<std::string>{"due", "--all", "--on", "2026-12-01"},
                                               {"summary", "--on", "2026-12-01"},
                                               {"summary", "--on", "2026-12-01", "--format", "json"},
                                               {"weight", "list", "--format", "json"},
                                               {"balance", "list"},
                                               {"pipette", "list", "--format", "json"},
                                               {"audit", "log"},
                                               {"certificate", "list"}}) {
    std::vector<std::string> full = {"--db", db};
    full.insert(full.end(), args.begin(), args.end());
    no_apology(args.front(), output(dir, full));
  }
  const json weights = json::parse(output(dir, {"--db", db, "weight", "list", "--format", "json"}));
  for (const auto& w : weights) {
    const std::string id = w["id"];
    no_apology("weight show " + id, output(dir, {"--db", db, "weight", "show", id}));
    no_apology("weight show json " + id, output(dir, {"--db", db, "weight", "show", id, "--format", "json"}));
  }
  for (const char* id : {"AB-01", "SM-02", "TL-03", "PF-500", "PV-1000", "PM8-200"}) {
    no_apology(std::string("history ") + id,
               output(dir, {"--db", db, "history", id, "--chart", dir.file(std::string(id) + ".svg").string()}));
    no_apology(std::string("history chart ") + id, read_file(dir.file(std::string(id) + ".svg")));
    no_apology(std::string("history json ") + id, output(dir, {"--db", db, "history", id, "--format", "json"}));
  }

  // Every run, as text and JSON, and a certificate of each (text, JSON, PDF).
  const auto last = run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path());
  REQUIRE(last.status == 0);
  const std::int64_t runs = json::parse(last.out)["run_id"].get<std::int64_t>();
  REQUIRE(runs > 5);
  for (std::int64_t id = 1; id <= runs; ++id) {
    const std::string run = std::to_string(id);
    no_apology("check show " + run, output(dir, {"--db", db, "check", "show", run}));
    no_apology("check show json " + run, output(dir, {"--db", db, "check", "show", run, "--format", "json"}));
  }
  const json list = json::parse(output(dir, {"--db", db, "certificate", "list", "--format", "json"}));
  REQUIRE_FALSE(list.empty());
  for (const auto& c : list) {
    const std::string number = c["number"];
    no_apology("certificate " + number, output(dir, {"--db", db, "certificate", "show", number}));
    no_apology("certificate json " + number,
               output(dir, {"--db", db, "certificate", "show", number, "--format", "json"}));
    const auto pdf = dir.file(number + ".pdf").string();
    output(dir, {"--db", db, "certificate", "show", number, "--format", "pdf", "--output", pdf});
    REQUIRE(std::system(("pdftotext '" + pdf + "' '" + pdf + ".txt'").c_str()) == 0);
    no_apology("certificate PDF " + number, read_file(pdf + ".txt"));
  }
}
