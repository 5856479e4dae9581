// The attacks on separation of duties of issue 15, each now refused: identity is the authenticated account, never a
// typed name, so no spelling of a name gets a person past the check that they did not record or correct the run.
#include <catch2/catch.hpp>

#include <fstream>

#include "support/run_plumb.hpp"

using plumb::test::run_plumb;
using plumb::test::ScratchDir;

namespace {

const std::string passing_readings =
    "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0002\n";
// The same set with its last reading typed wrong (100.0020 for 100.0002), corrected below.
const std::string corrected_readings =
    "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0003\n";

void ok(const std::vector<std::string>& args, const ScratchDir& dir) {
  const auto r = run_plumb(args, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
}

std::string count_of(const std::string& db, const std::string& table) {
  const std::string out = db + ".count.txt";
  REQUIRE(std::system(("sqlite3 '" + db + "' 'SELECT count(*) FROM " + table + "' > '" + out + "'").c_str()) == 0);
  std::ifstream in(out);
  std::string n;
  std::getline(in, n);
  return n;
}

/// Run 1 recorded by "P. Lindgren" and its certificate issued.
std::string recorded_by_lindgren(const ScratchDir& dir) {
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("ok.csv", passing_readings);
  ok({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "ok.csv", "--on", "2026-11-02", "--as",
      "P. Lindgren"},
     dir);
  ok({"--db", db, "certificate", "issue", "1", "--as", "P. Lindgren"}, dir);
  return db;
}

}  // namespace

TEST_CASE("the account that recorded a run cannot approve its certificate under another name", "[attacks]") {
  ScratchDir dir;
  const auto db = recorded_by_lindgren(dir);
  // Another name typed on the command line is refused outright ...
  auto r = run_plumb({"--db", db, "certificate", "approve", "1", "--meaning", "reviewed and approved", "--as",
                      "P. Lindgren", "--by", "Q. Manager"},
                     dir.path());
  CHECK(r.status == 2);
  CHECK(r.err.find("--by is gone") != std::string::npos);
  // ... and the account itself, whatever it is called, is the one that recorded the run.
  r = run_plumb(
      {"--db", db, "certificate", "approve", "1", "--meaning", "reviewed and approved", "--as", "P. Lindgren"},
      dir.path());
  CHECK(r.status == 4);
  CHECK(r.err.find("P. Lindgren (user ") != std::string::npos);
  CHECK(r.err.find("recorded check run 1 of certificate BC-") != std::string::npos);
  CHECK(count_of(db, "certificate_events") == "0");
  // Someone else may.
  ok({"--db", db, "certificate", "approve", "1", "--meaning", "reviewed and approved", "--as", "Q. Manager"}, dir);
}

TEST_CASE("look-alike names (no-break space, zero-width space, Cyrillic letter) do not pass the check", "[attacks]") {
  ScratchDir dir;
  const auto db = recorded_by_lindgren(dir);
  const auto admin_pw = dir.file(".plumb-test-password").string();
  // No account can be given a name with an invisible or no-break space ...
  for (const std::string name : {"P.\u00A0Lindgren", "P. Lind\u200Bgren"}) {
    const auto r = run_plumb({"--db", db, "--user", "test-admin", "--password-file", admin_pw, "user", "add", "p2",
                              "--name", name, "--role", "reviewer", "--new-password-file", admin_pw},
                             dir.path());
    CHECK(r.status == 2);
    CHECK(r.err.find("--name") != std::string::npos);
  }
  // ... and a look-alike spelling typed by the operator changes nothing: the check compares accounts, not names.
  // "P. Lindgrеn" with U+0435 CYRILLIC SMALL LETTER IE is a different account here (a different person, as far
  // as plumb can know), so its approval is allowed; the operator's own account is still refused.
  auto r = run_plumb({"--db", db, "certificate", "approve", "1", "--meaning", "reviewed and approved", "--as",
                      "P. Lindgren", "--by", "P. Lindgr\u0435n"},
                     dir.path());
  CHECK(r.status == 2);
  r = run_plumb(
      {"--db", db, "certificate", "approve", "1", "--meaning", "reviewed and approved", "--as", "P. Lindgren"},
      dir.path());
  CHECK(r.status == 4);
  CHECK(count_of(db, "certificate_events") == "0");
}

TEST_CASE("an operator who corrects her own run cannot approve the replacement", "[attacks]") {
  ScratchDir dir;
  const auto db = recorded_by_lindgren(dir);
  dir.write("fixed.csv", corrected_readings);
  // The correction is hers (her account wrote it), whatever operator name the run carries.
  ok({"--db", db, "check", "correct", "1", "--readings", "fixed.csv", "--reason", "last reading mistyped", "--as",
      "P. Lindgren"},
     dir);
  const auto r = run_plumb(
      {"--db", db, "certificate", "approve", "LAST", "--meaning", "reviewed and approved", "--as", "P. Lindgren"},
      dir.path());
  CHECK(r.status == 4);
  CHECK(r.err.find("recorded the correction check run 2") != std::string::npos);
  CHECK(count_of(db, "signatures") == "1");  // the correction's; no approval
}

TEST_CASE("the author of a correction cannot approve its certificate, nor can the operator of the original",
          "[attacks]") {
  ScratchDir dir;
  const auto db = recorded_by_lindgren(dir);
  dir.write("fixed.csv", corrected_readings);
  ok({"--db", db, "check", "correct", "1", "--readings", "fixed.csv", "--reason", "last reading mistyped", "--as",
      "R. Reviewer"},
     dir);
  auto r = run_plumb(
      {"--db", db, "certificate", "approve", "LAST", "--meaning", "reviewed and approved", "--as", "R. Reviewer"},
      dir.path());
  CHECK(r.status == 4);
  CHECK(r.err.find("R. Reviewer (user ") != std::string::npos);
  CHECK(r.err.find("recorded the correction check run 2") != std::string::npos);
  r = run_plumb(
      {"--db", db, "certificate", "approve", "LAST", "--meaning", "reviewed and approved", "--as", "P. Lindgren"},
      dir.path());
  CHECK(r.status == 4);
  CHECK(r.err.find("recorded check run 1") != std::string::npos);
  // A third person may; the correction and the approval are each signed.
  ok({"--db", db, "certificate", "approve", "LAST", "--meaning", "reviewed and approved", "--as", "Q. Manager"}, dir);
  CHECK(count_of(db, "signatures") == "2");
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);
}
