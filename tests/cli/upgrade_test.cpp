// A database written by plumb before user accounts and signed checkpoints (commit dce2d5b, migrations 001-010,
// people named by free text), opened by today's plumb: tests/fixtures/pre-accounts/lab.sql, made by make.sh beside it
// with that older binary. Its records stay as they were, marked as written before user accounts; it gets its key and
// its first administrator; and from then on everything is signed and attributed to accounts.
#include <catch2/catch.hpp>

#include <cstdlib>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

#include "support/paths.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::run_plumb;
using plumb::test::ScratchDir;

namespace {

std::filesystem::path old_database(const ScratchDir& dir) {
  const auto fixture = plumb::test::source_dir() / "tests" / "fixtures" / "pre-accounts" / "lab.sql";
  REQUIRE(std::filesystem::exists(fixture));
  const auto db = dir.file("old.db");
  const std::string cmd = "sqlite3 '" + db.string() + "' < '" + fixture.string() + "'";
  REQUIRE(std::system(cmd.c_str()) == 0);
  return db;
}

std::string secret_file(const ScratchDir& dir, const std::string& name, const std::string& password) {
  dir.write(name, password + "\n");
  std::filesystem::permissions(dir.file(name),
                               std::filesystem::perms::owner_read | std::filesystem::perms::owner_write);
  return dir.file(name).string();
}

}  // namespace

TEST_CASE("a database from before user accounts opens, keeps its records as they were and joins accounts",
          "[cli][people][upgrade]") {
  ScratchDir dir;
  const auto db = old_database(dir);
  // What the older plumb wrote (make.sh): the lab, W100 and its certificate, BAL-7 with its balance row, two runs by
  // "Rui Tanabe", two certificates, the first approved by "Hana Okafor".
  REQUIRE(plumb::test::sqlite_shell(db, "PRAGMA user_version") == "10\n");
  const std::string records_before = plumb::test::sqlite_shell(db, "SELECT count(*) FROM audit_log");
  const std::string first_hashes = plumb::test::sqlite_shell(db, "SELECT group_concat(hash) FROM audit_log");

  // The older records are read at once, each still chained as it was.
  auto r = run_plumb({"--db", db.string(), "audit", "log", "--format", "json"}, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const json old_log = json::parse(r.out);
  REQUIRE(std::to_string(old_log["records"].size()) + "\n" == records_before);
  for (const auto& rec : old_log["records"]) {
    CHECK(rec["user_id"].is_null());
    CHECK(rec["user"] == "written before user accounts");
  }
  CHECK(old_log["records"].back()["actor"] == "Rui Tanabe");
  CHECK(plumb::test::sqlite_shell(db, "PRAGMA user_version") !=
        "10\n");  // the migrations since then were applied on opening

  // Nothing is written before the lab's key exists; then the older records are covered by its first checkpoint.
  r = run_plumb({"--db", db.string(), "key", "create"}, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("it covers the " + records_before.substr(0, records_before.size() - 1) +
                                    " records written before checkpoints"));

  // Its first administrator, added the way a new database gets one.
  const auto admin_pw = secret_file(dir, "admin.pw", "an upgrade admin password");
  r = run_plumb(
      {"--db", db.string(), "--password-file", admin_pw, "init", "--admin", "hokafor", "--admin-name", "Hana Okafor"},
      dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("Added the first administrator hokafor (Hana Okafor)"));
  // A database that holds records never takes the test-only fast hashing, whatever the environment says.
  CHECK(plumb::test::sqlite_shell(db, "SELECT password_hashing FROM security_settings") == "moderate\n");

  // A reviewer approves the older draft (its run has no user id: nobody's account recorded it).
  const auto first_pw = secret_file(dir, "first.pw", "a first reviewer password");
  const auto reviewer_pw = secret_file(dir, "reviewer.pw", "the reviewer's own password");
  r = run_plumb({"--db", db.string(), "--user", "hokafor", "--password-file", admin_pw, "user", "add", "lmoreau",
                 "--name", "Lise Moreau", "--role", "reviewer", "--new-password-file", first_pw},
                dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  r = run_plumb({"--db", db.string(), "--user", "lmoreau", "--password-file", first_pw, "user", "password",
                 "--new-password-file", reviewer_pw},
                dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  r = run_plumb({"--db", db.string(), "--user", "lmoreau", "--password-file", reviewer_pw, "certificate", "approve",
                 "LAST", "--meaning", "reviewed and approved"},
                dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);

  // The older records are unchanged (same hashes, in the same order) and still say who wrote them then.
  CHECK(plumb::test::sqlite_shell(db, "SELECT group_concat(hash) FROM (SELECT hash FROM audit_log WHERE seq <= " +
                                          records_before.substr(0, records_before.size() - 1) + " ORDER BY seq)") ==
        first_hashes);
  r = run_plumb({"--db", db.string(), "audit", "log"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("  Rui Tanabe [written before user accounts]  recorded check run 2 on BAL-7") &&
                        Catch::Contains("  Hana Okafor [hokafor]  added user hokafor") &&
                        Catch::Contains("  Lise Moreau [lmoreau]  approved certificate"));
  // Every record since the first account names one.
  CHECK(plumb::test::sqlite_shell(db, "SELECT count(*) FROM audit_log WHERE user_id IS NULL AND seq > " +
                                          records_before.substr(0, records_before.size() - 1)) == "0\n");

  // The whole history verifies offline with the public key alone.
  r = run_plumb({"--db", db.string(), "audit", "verify", "--public-key", dir.file("old.db.pub").string()}, dir.path());
  INFO(r.err);
  CHECK(r.status == 0);

  // The approved certificate shows the signature in its rendering.
  r = run_plumb({"--db", db.string(), "certificate", "show", "LAST"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("Lise Moreau") && Catch::Contains("signed electronically on"));
}
