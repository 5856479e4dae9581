// Free text through the built binary: every option and every CSV field is checked by one rule
// (src/core/text_field.hpp), so a line break in --by cannot forge a line of `audit log`, and bytes that are not
// UTF-8 are refused naming the field instead of failing inside the audit trail's JSON.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <fstream>

#include "support/run_plumb.hpp"

using plumb::test::run_plumb;

namespace {

const std::string readings =
    "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0002\n";

std::size_t lines_of(const std::string& s) {
  return static_cast<std::size_t>(std::count(s.begin(), s.end(), '\n'));
}

}  // namespace

TEST_CASE("a line break in a user's printed name is refused and cannot forge a line of the audit log",
          "[cli][text_field]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  // The printed name of an account is the only name plumb records with a write: the forgery is tried there.
  dir.write("first.pw", "a-first-password-long-enough\n");
  std::filesystem::permissions(dir.file("first.pw"),
                               std::filesystem::perms::owner_read | std::filesystem::perms::owner_write);
  const std::string forged = "A. Technician\n#999    2026-11-30T09:00:00Z  Head of Quality (OS account root)";
  auto r = run_plumb({"--db", db, "user", "add", "forger", "--name", forged, "--role", "technician",
                      "--new-password-file", "first.pw", "--as", "Test Administrator"},
                     dir.path());
  CHECK(r.status == 2);
  CHECK(r.out.empty());
  CHECK(lines_of(r.err) == 1);
  CHECK_THAT(r.err, Catch::StartsWith("plumb: --name \"A. Technician\\n#999") && Catch::Contains("line break"));

  r = run_plumb({"--db", db, "audit", "log"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, !Catch::Contains("#999"));
}

TEST_CASE("a name with a line break stored behind plumb's back is shown on one line", "[cli][text_field]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  // The sqlite3 shell appends a record whose actor holds a line break and a fake record after it (audit verify
  // would name the broken chain; the log must still not show the fake record as a record of its own).
  const std::string sql =
      "INSERT INTO audit_log (at, os_user, actor, action, table_name, row_key, prev_hash, hash) VALUES "
      "('2026-11-30T08:00:00Z', 'x', 'Intruder' || char(10) || '#999    2026-11-30T09:00:00Z  Head of Quality', "
      "'insert', 'lab', '9', 'x', 'y');";
  REQUIRE(std::system(("sqlite3 '" + db + "' \"" + sql + "\" >/dev/null 2>&1").c_str()) == 0);
  const auto r = run_plumb({"--db", db, "audit", "log"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("Intruder\\n#999"));
  CHECK_THAT(r.out, !Catch::Contains("\n#999"));
}

TEST_CASE("text in any script is kept exactly as typed", "[cli][text_field]") {
  plumb::test::ScratchDir dir;
  const auto db = dir.file("lab.db").string();
  const std::string lab =
      "\xC3\x85ngstr\xC3\xB6m-Labor M\xC3\xBC"
      "ller";  // Ångström-Labor Müller
  auto r = run_plumb({"--db", db, "init", "--lab", lab}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains(lab));
  r = run_plumb({"--db", db, "audit", "log", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains(lab));
}
