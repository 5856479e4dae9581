// Every file in tests/malformed/ is one bad input and one ctest test, "malformed: <file stem>" (added by
// tests/CMakeLists.txt, which runs the hidden case below with the file in PLUMB_MALFORMED_CASE). The command
// must exit 2, print one sentence on stderr naming the place at fault, leave the database exactly as it was
// (sqlite3 .dump before == after) and leave no file behind.
//
// A case holds "description", "args" (with {db}), "message" (parts that stderr must contain), and optionally
// "fixture", "files", "setup" and "stdin". JSON text is UTF-8, so a byte that is not (for the cases of text
// that is not UTF-8) is written {byte:FF} in args, files and stdin. "{dcc_schema}" in an argument is the DCC 3.1.2
// schema of the reference data (a case using it is skipped, saying why, when the reference data is absent). A
// fixture, tests/malformed/fixtures/<name>.json, is the lab that many cases share: its own "files" and "setup",
// optionally a base "fixture" prepared before it, and "baseline": false when the weekly check that every case
// otherwise starts from must not be recorded.
// Preparation order: the example lab, the baseline check, the fixture's files then setup (base fixture
// first), then the case's files then setup.
#include <catch2/catch.hpp>

#include <cstdlib>
#include <fstream>
#include <nlohmann/json.hpp>
#include <set>

#include "support/paths.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
namespace fs = std::filesystem;

namespace {

fs::path malformed_dir() {
  return plumb::test::source_dir() / "tests" / "malformed";
}

json read_json(const fs::path& file) {
  std::ifstream in(file);
  if (!in) throw std::runtime_error("cannot read " + file.string());
  return json::parse(in);
}

std::vector<fs::path> cases() {
  std::vector<fs::path> files;
  for (const auto& e : fs::directory_iterator(malformed_dir()))
    if (e.path().extension() == ".json") files.push_back(e.path());
  std::sort(files.begin(), files.end());
  return files;
}

/// "{byte:FF}" -> the byte 0xFF.
std::string with_bytes(std::string s) {
  for (std::size_t p; (p = s.find("{byte:")) != std::string::npos;) {
    if (p + 9 > s.size() || s[p + 8] != '}') throw std::runtime_error("malformed {byte:XX} in \"" + s + "\"");
    s.replace(p, 9, 1, static_cast<char>(std::stoi(s.substr(p + 6, 2), nullptr, 16)));
  }
  return s;
}

/// The DCC 3.1.2 schema with a local D-SI import, from the reference data (empty when that is absent).
std::string dcc_schema() {
  const auto root = plumb::test::reference_data();
  return root ? (*root / "dcc" / "dcc-3.1.2-local.xsd").string() : std::string();
}

std::string substitute(std::string s, const std::string& db) {
  for (std::size_t p; (p = s.find("{db}")) != std::string::npos;) s.replace(p, 4, db);
  for (std::size_t p; (p = s.find("{dcc_schema}")) != std::string::npos;) s.replace(p, 12, dcc_schema());
  return with_bytes(s);
}

/// What is written and run before a case's command, in order.
struct Preparation {
  bool baseline = true;
  std::vector<json> parts;  ///< fixtures (base first), then the case itself: each with "files" and "setup"
};

void add_fixture(const std::string& name, Preparation& prep, int depth = 0) {
  if (depth > 4) throw std::runtime_error("fixture \"" + name + "\": fixtures nest more than 4 deep");
  const json f = read_json(malformed_dir() / "fixtures" / (name + ".json"));
  if (f.contains("fixture")) add_fixture(f["fixture"].get<std::string>(), prep, depth + 1);
  if (f.contains("baseline")) prep.baseline = f["baseline"].get<bool>();
  prep.parts.push_back(f);
}

Preparation preparation_of(const json& c) {
  Preparation prep;
  if (c.contains("fixture")) add_fixture(c["fixture"].get<std::string>(), prep);
  prep.parts.push_back(c);
  return prep;
}

std::string shell_line(const std::vector<std::string>& args) {
  std::string line = "plumb";
  for (const auto& a : args) line += " " + a;
  return line;
}

/// Every file and folder under `dir`, relative, except SQLite's own companions of the database
/// (-wal, -shm, -journal), which come and go with any connection.
std::set<std::string> listing(const fs::path& dir) {
  std::set<std::string> names;
  for (const auto& e : fs::recursive_directory_iterator(dir)) {
    const std::string name = fs::relative(e.path(), dir).string();
    const bool companion = name.ends_with("-wal") || name.ends_with("-shm") || name.ends_with("-journal");
    if (!companion) names.insert(name);
  }
  return names;
}

void run_case(const fs::path& file) {
  const json c = read_json(file);
  INFO("case " << file.filename().string() << ": " << c.value("description", ""));
  if (c.dump().find("{dcc_schema}") != std::string::npos && dcc_schema().empty()) {
    WARN("skipped: the case needs the DCC schema of shared/reference-data/dcc (set PLUMB_REFERENCE_DATA)");
    return;
  }
  const Preparation prep = preparation_of(c);
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  if (prep.baseline) {
    // A baseline run so that tables other than the registry are populated too.
    // Ten readings: USP <41> asks for not less than 10 replicate weighings.
    dir.write("ok.csv",
              "reading\n100.0003\n100.0001\n100.0002\n100.0002\n100.0003\n100.0001\n100.0002\n100.0004\n"
              "100.0002\n100.0003\n");
    const auto r = plumb::test::run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings",
                                           "ok.csv", "--on", "2026-11-02", "--as", "A. Technician"},
                                          dir.path());
    INFO("baseline check, stderr: " << r.err);
    REQUIRE(r.status == 0);
  }
  for (const auto& part : prep.parts) {
    // Files first: setup steps may read them (e.g. a balance check before a pipette check).
    const json files = part.value("files", json::object());  // named: items() must not outlive it
    for (const auto& [name, text] : files.items()) dir.write(name, with_bytes(text.get<std::string>()));
    for (const auto& step : part.value("setup", json::array())) {
      std::vector<std::string> setup_args;
      for (const auto& a : step) setup_args.push_back(substitute(a.get<std::string>(), db));
      const auto r = plumb::test::run_plumb(setup_args, dir.path());
      INFO("setup " << shell_line(setup_args) << "\nstderr: " << r.err);
      REQUIRE(r.status == 0);
    }
  }
  std::vector<std::string> args;
  for (const auto& a : c.at("args")) args.push_back(substitute(a.get<std::string>(), db));
  // The member the command logs in as exists before the "before" picture: creating it is not the command's doing.
  plumb::test::prepare_login(args, dir.path());
  const std::string before = plumb::test::dump_database(db);
  const auto files_before = listing(dir.path());
  const auto r = plumb::test::run_plumb(args, dir.path(), with_bytes(c.value("stdin", "")));
  INFO(shell_line(args) << "\nexit status " << r.status << "\nstdout: " << r.out << "\nstderr: " << r.err);
  CHECK(r.status == 2);
  CHECK(r.out.empty());
  // One sentence on one line, starting "plumb: ".
  CHECK(r.err.rfind("plumb: ", 0) == 0);
  CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
  REQUIRE(c.at("message").is_array());
  for (const auto& part : c["message"]) CHECK_THAT(r.err, Catch::Contains(part.get<std::string>()));
  // No file left behind: the folder holds what it held before the command.
  CHECK(listing(dir.path()) == files_before);
  CHECK(plumb::test::dump_database(db) == before);
}

}  // namespace

// Hidden ("[.]"): catch_discover_tests leaves it out; tests/CMakeLists.txt runs it once per case file.
TEST_CASE("malformed input case from PLUMB_MALFORMED_CASE", "[.][malformed]") {
  const char* file = std::getenv("PLUMB_MALFORMED_CASE");
  INFO("PLUMB_MALFORMED_CASE names the case file; ctest sets it for each \"malformed: <stem>\" test");
  REQUIRE(file != nullptr);
  REQUIRE(fs::is_regular_file(file));
  run_case(file);
}

TEST_CASE("malformed input cases are well formed and their fixtures exist", "[malformed]") {
  const auto files = cases();
  REQUIRE(files.size() >= 40);
  for (const auto& file : files) {
    INFO(file.filename().string());
    const json c = read_json(file);
    CHECK(!c.value("description", "").empty());
    CHECK(c.contains("args"));
    REQUIRE(c.contains("message"));
    CHECK(!c["message"].empty());
    CHECK_NOTHROW(preparation_of(c));
  }
}
