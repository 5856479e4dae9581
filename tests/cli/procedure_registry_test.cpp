// Walks the procedure registry (checks/procedure.hpp): every procedure has a certificate prefix and kind of its
// own, is named in `check record --help`, and has a renderer for every format of a run (text, JSON with the
// registry's result members) and of its certificate (text, JSON, PDF). The runs come from the demo lab, which
// must record at least one run of every procedure: a new procedure is not done until the demo shows it.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>
#include <algorithm>
#include <fstream>
#include <set>

#include "checks/procedure.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::checks::all_procedures;
using plumb::checks::spec;
using plumb::test::run_plumb;
using plumb::test::ScratchDir;

TEST_CASE("each registry row is complete and its keys are unique", "[registry]") {
  std::set<std::string_view> keys, prefixes, kinds;
  for (const auto p : all_procedures) {
    const auto& s = spec(p);
    INFO(s.key);
    CHECK(s.procedure == p);
    CHECK(keys.insert(s.key).second);
    CHECK(s.certificate_prefix.size() == 2);
    CHECK(prefixes.insert(s.certificate_prefix).second);
    CHECK(kinds.insert(s.certificate_kind).second);
    CHECK(!s.certificate_title.empty());
    CHECK(!s.summary.empty());
    CHECK(!s.result_keys.empty());
    CHECK(plumb::checks::find_procedure(s.key) == p);
    CHECK(plumb::checks::procedure_of_certificate_kind(s.certificate_kind) == p);
    for (const auto option : s.options) {
      const auto all = plumb::checks::procedure_options();
      CHECK(std::find(all.begin(), all.end(), option) != all.end());
    }
  }
  CHECK_THROWS_WITH(plumb::checks::parse_procedure("wobble"),
                    Catch::Contains("--procedure \"wobble\" is not known") && Catch::Contains("repeatability"));
}

TEST_CASE("every procedure has a run and a certificate in every format", "[registry][cli]") {
  ScratchDir dir;
  REQUIRE(run_plumb({"demo"}, dir.path()).status == 0);
  const std::string db = dir.file("plumb-demo.db").string();
  const auto help = run_plumb({"check", "record", "--help"}, dir.path());
  REQUIRE(help.status == 0);
  for (const auto p : all_procedures) {
    const auto& s = spec(p);
    const std::string key(s.key);
    INFO("procedure " << key);
    CHECK_THAT(help.out, Catch::Contains(key));

    // The demo's latest run of this procedure, found with the sqlite3 shell (not with plumb, which is under test).
    const auto found = dir.file("run.txt").string();
    const std::string query = "sqlite3 '" + db + "' \"SELECT max(id) FROM check_runs WHERE procedure = '" + key +
                              "'\" > '" + found + "'";
    REQUIRE(std::system(query.c_str()) == 0);
    std::ifstream found_in(found);
    std::int64_t run = 0;
    found_in >> run;
    REQUIRE(run > 0);
    const std::string id = std::to_string(run);

    const auto text = run_plumb({"--db", db, "check", "show", id}, dir.path());
    REQUIRE(text.status == 0);
    CHECK_THAT(text.out, Catch::StartsWith("Run " + id + ": "));
    const auto shown = run_plumb({"--db", db, "check", "show", id, "--format", "json"}, dir.path());
    REQUIRE(shown.status == 0);
    const json j = json::parse(shown.out);
    CHECK(j["procedure"] == key);
    for (const auto member : s.result_keys) CHECK(j.contains(std::string(member)));

    const auto issued = run_plumb({"--db", db, "certificate", "issue", id, "--format", "json"}, dir.path());
    REQUIRE(issued.status == 0);
    const json cert = json::parse(issued.out);
    const std::string number = cert["number"];
    CHECK_THAT(number, Catch::StartsWith(std::string(s.certificate_prefix) + "-"));
    CHECK(cert["kind"] == std::string(s.certificate_kind));
    CHECK(cert["title"] == std::string(s.certificate_title));
    const auto cert_text = run_plumb({"--db", db, "certificate", "show", number}, dir.path());
    REQUIRE(cert_text.status == 0);
    const std::string title(s.certificate_title);
    CHECK_THAT(cert_text.out, Catch::Contains(title) && Catch::Contains("No. " + number));
    const auto pdf = dir.file(number + ".pdf").string();
    REQUIRE(run_plumb({"--db", db, "certificate", "show", number, "--format", "pdf", "--output", pdf}, dir.path())
                .status == 0);
    const std::string cmd = "pdftotext '" + pdf + "' '" + pdf + ".txt'";
    REQUIRE(std::system(cmd.c_str()) == 0);
    std::ifstream in(pdf + ".txt");
    const std::string pdf_text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    CHECK_THAT(pdf_text, Catch::Contains(std::string(s.certificate_title)) && Catch::Contains(number));
  }
}
