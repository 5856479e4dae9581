// Every file in tests/malformed/ is one bad input: the command must exit 2, print one sentence on stderr
// naming the place at fault, and leave the database exactly as it was (sqlite3 .dump before == after).
#include <catch2/catch.hpp>

#include <fstream>
#include <nlohmann/json.hpp>

#include "support/paths.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;

namespace {

std::vector<std::filesystem::path> cases() {
  std::vector<std::filesystem::path> files;
  for (const auto& e : std::filesystem::directory_iterator(plumb::test::source_dir() / "tests" / "malformed"))
    if (e.path().extension() == ".json") files.push_back(e.path());
  std::sort(files.begin(), files.end());
  return files;
}

std::string substitute(std::string s, const std::string& db) {
  for (std::size_t p; (p = s.find("{db}")) != std::string::npos;) s.replace(p, 4, db);
  return s;
}

}  // namespace

TEST_CASE("malformed inputs exit 2 with a clear message and change nothing", "[cli][malformed]") {
  const auto files = cases();
  REQUIRE(files.size() >= 40);
  for (const auto& file : files) {
    SECTION(file.filename().string()) {
      std::ifstream in(file);
      const json c = json::parse(in);
      plumb::test::ScratchDir dir;
      const auto db = plumb::test::example_lab(dir).string();
      // A baseline run so that tables other than the registry are populated too.
      dir.write("ok.csv", "reading\n100.0003\n100.0001\n100.0002\n");
      REQUIRE(plumb::test::run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings",
                                      "ok.csv", "--on", "2026-11-02", "--by", "A. Technician"},
                                     dir.path())
                  .status == 0);
      // Files first: setup steps may read them (e.g. a balance check before a pipette check).
      const json extra = c.value("files", json::object());
      for (const auto& [name, text] : extra.items()) dir.write(name, text.get<std::string>());
      for (const auto& step : c.value("setup", json::array())) {
        std::vector<std::string> setup_args;
        for (const auto& a : step) setup_args.push_back(substitute(a.get<std::string>(), db));
        REQUIRE(plumb::test::run_plumb(setup_args, dir.path()).status == 0);
      }
      std::vector<std::string> args;
      for (const auto& a : c["args"]) args.push_back(substitute(a.get<std::string>(), db));
      const std::string before = plumb::test::dump_database(db);
      const auto r = plumb::test::run_plumb(args, dir.path(), c.value("stdin", ""));
      INFO(c.value("description", "") << "\nstderr: " << r.err);
      CHECK(r.status == 2);
      CHECK(r.out.empty());
      // One sentence on one line, starting "plumb: ".
      CHECK(r.err.rfind("plumb: ", 0) == 0);
      CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
      for (const auto& part : c["message"]) CHECK_THAT(r.err, Catch::Contains(part.get<std::string>()));
      CHECK(plumb::test::dump_database(db) == before);
    }
  }
}
