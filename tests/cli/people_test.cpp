// User accounts, log-in and electronic signatures as 21 CFR Part 11 asks (11.10(d), 11.50, 11.70, 11.100, 11.200,
// 11.300; EU GMP Annex 11 item 12), each behaviour shown on a scratch database through the built binary. The
// Part 11 section numbers are cited from the regulation's text as published in the eCFR (Title 21, Chapter I,
// Subchapter A, Part 11), recalled from memory for this comment.
#include <sys/stat.h>
#include <catch2/catch.hpp>

#include <fstream>
#include <nlohmann/json.hpp>

#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::run_plumb;
using plumb::test::ScratchDir;

namespace {

const std::string passing_readings =
    "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0002\n";

unsigned mode_of(const std::filesystem::path& p) {
  struct stat st {};
  REQUIRE(::stat(p.c_str(), &st) == 0);
  return st.st_mode & 07777;
}

std::string secret_file(const ScratchDir& dir, const std::string& name, const std::string& password) {
  dir.write(name, password + "\n");
  ::chmod(dir.file(name).c_str(), 0600);
  return dir.file(name).string();
}

/// Runs plumb exactly as given (no test log-in added): the helper leaves arguments with --user alone.
plumb::test::RunResult as_user(const std::string& db, const std::string& login, const std::string& password_file,
                               std::vector<std::string> rest, const ScratchDir& dir) {
  std::vector<std::string> args = {"--db", db, "--user", login, "--password-file", password_file};
  args.insert(args.end(), rest.begin(), rest.end());
  return run_plumb(args, dir.path());
}

/// The example lab with a passing weekly check of BAL-A recorded by "A. Technician" and its certificate issued.
std::string lab_with_certificate(const ScratchDir& dir) {
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("ok.csv", passing_readings);
  auto r = run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "ok.csv", "--on",
                      "2026-11-02", "--as", "A. Technician"},
                     dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  r = run_plumb({"--db", db, "certificate", "issue", "1", "--as", "A. Technician"}, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  return db;
}

}  // namespace

TEST_CASE("a new database is created with its first administrator, folder 0700 and file 0600", "[people][files]") {
  ScratchDir dir;
  const auto pw = secret_file(dir, "admin.pw", "a long admin password");
  const auto db = (dir.path() / "new-folder" / "lab.db").string();
  const auto r = run_plumb(
      {"--db", db, "--password-file", pw, "init", "--lab", "Files Lab", "--admin", "ada", "--admin-name", "Ada Quill"},
      dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK(mode_of(dir.path() / "new-folder") == 0700);
  CHECK(mode_of(db) == 0600);
  CHECK(plumb::test::sqlite_shell(db, "SELECT id, login, full_name FROM users") == "1|ada|Ada Quill\n");
  CHECK(plumb::test::sqlite_shell(db, "SELECT role FROM account_events WHERE user_id = 1") == "administrator\n");
  // Every record of the new database names the administrator's account.
  CHECK(plumb::test::sqlite_shell(db, "SELECT count(*) FROM audit_log WHERE user_id IS NOT 1") == "0\n");
  // The password is kept only as an Argon2id hash.
  CHECK(plumb::test::sqlite_shell(db, "SELECT substr(hash, 1, 10) FROM passwords") == "$argon2id$\n");
  CHECK(plumb::test::sqlite_shell(db, "SELECT count(*) FROM passwords WHERE hash LIKE '%a long admin password%'") ==
        "0\n");
}

TEST_CASE("the administrator manages accounts and nothing else, and roles decide who may do what", "[people]") {
  ScratchDir dir;
  const auto db = lab_with_certificate(dir);
  // The administrator cannot record a check; a technician cannot add a balance or approve.
  dir.write("ok.csv", passing_readings);
  auto r = run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "ok.csv", "--on",
                      "2026-11-03", "--as", "Test Administrator"},
                     dir.path());
  CHECK(r.status == 4);
  CHECK(r.err ==
        "plumb: user test-admin may not run `plumb check record`: it needs the role technician or reviewer "
        "or quality manager.\n");
  const auto first = secret_file(dir, "first.pw", "first password 0001");
  const auto admin_pw = dir.file(".plumb-test-password").string();
  r = as_user(db, "test-admin", admin_pw,
              {"user", "add", "tina", "--name", "Tina Okafor", "--role", "technician", "--new-password-file", first},
              dir);
  INFO(r.err);
  REQUIRE(r.status == 0);
  const auto own = secret_file(dir, "tina.pw", "tina's own password");
  r = as_user(db, "tina", first, {"user", "password", "--new-password-file", own}, dir);
  REQUIRE(r.status == 0);
  r = as_user(db, "tina", own, {"certificate", "approve", "1", "--meaning", "reviewed and approved"}, dir);
  CHECK(r.status == 4);
  CHECK(r.err.find("needs the role reviewer or quality manager") != std::string::npos);
  // Granting is recorded, and an administrator cannot grant roles to their own account.
  r = as_user(db, "test-admin", admin_pw, {"user", "grant", "tina", "--role", "reviewer"}, dir);
  REQUIRE(r.status == 0);
  r = as_user(db, "test-admin", admin_pw, {"user", "grant", "test-admin", "--role", "reviewer"}, dir);
  CHECK(r.status == 4);
  CHECK(r.err.find("may not change the roles of their own account") != std::string::npos);
  CHECK(plumb::test::sqlite_shell(
            db,
            "SELECT event, role FROM account_events WHERE user_id = (SELECT id FROM users WHERE login = 'tina') "
            "ORDER BY id") == "role granted|technician\nrole granted|reviewer\n");
  r = as_user(db, "test-admin", admin_pw, {"user", "revoke", "tina", "--role", "reviewer", "--reason", "trial over"},
              dir);
  REQUIRE(r.status == 0);
  r = as_user(db, "tina", own, {"certificate", "approve", "1", "--meaning", "reviewed and approved"}, dir);
  CHECK(r.status == 4);
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);
}

TEST_CASE("a user id is never reused and a deactivated user cannot log in", "[people]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto admin_pw = dir.file(".plumb-test-password").string();
  const auto first = secret_file(dir, "first.pw", "first password 0001");
  auto r = as_user(
      db, "test-admin", admin_pw,
      {"user", "add", "omar", "--name", "Omar Lindqvist", "--role", "technician", "--new-password-file", first}, dir);
  REQUIRE(r.status == 0);
  r = as_user(db, "test-admin", admin_pw, {"user", "deactivate", "omar", "--reason", "left the lab"}, dir);
  REQUIRE(r.status == 0);
  r = as_user(db, "omar", first, {"login"}, dir);
  CHECK(r.status == 4);
  CHECK(r.err == "plumb: the account omar is deactivated; it cannot log in.\n");
  // The id cannot be given to someone else, and the account is still there.
  r = as_user(
      db, "test-admin", admin_pw,
      {"user", "add", "omar", "--name", "Omar Someone-Else", "--role", "technician", "--new-password-file", first},
      dir);
  CHECK(r.status == 2);
  CHECK(r.err == "plumb: user id \"omar\" exists already (Omar Lindqvist); user ids are never reused.\n");
  // Numeric ids are never reused either, even if rows were deleted behind plumb's back (AUTOINCREMENT).
  const std::string before = plumb::test::sqlite_shell(db, "SELECT max(id) FROM users");
  REQUIRE(std::system(("sqlite3 '" + db +
                       "' \"DROP TRIGGER users_no_delete; DROP TRIGGER account_events_no_delete; DROP TRIGGER "
                       "passwords_no_delete; DELETE FROM account_events WHERE "
                       "user_id = " +
                       before.substr(0, before.size() - 1) + "; DELETE FROM passwords WHERE user_id = " +
                       before.substr(0, before.size() - 1) + "; DELETE FROM users WHERE login = 'omar'\"")
                          .c_str()) == 0);
  r = as_user(db, "test-admin", admin_pw,
              {"user", "add", "nadia", "--name", "Nadia Holm", "--role", "technician", "--new-password-file", first},
              dir);
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK(std::stoi(plumb::test::sqlite_shell(db, "SELECT id FROM users WHERE login = 'nadia'")) ==
        std::stoi(before) + 1);
}

TEST_CASE("failed log-ins lock the account at the lab's limit, and that is recorded", "[people]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto admin_pw = dir.file(".plumb-test-password").string();
  REQUIRE(as_user(db, "test-admin", admin_pw, {"user", "policy", "--lock-after", "3"}, dir).status == 0);
  const auto first = secret_file(dir, "first.pw", "first password 0001");
  REQUIRE(as_user(db, "test-admin", admin_pw,
                  {"user", "add", "lea", "--name", "Lea Brandt", "--role", "technician", "--new-password-file", first},
                  dir)
              .status == 0);
  const auto wrong = secret_file(dir, "wrong.pw", "not the password at all");
  for (int i = 0; i < 3; ++i) {
    const auto r = as_user(db, "lea", wrong, {"login"}, dir);
    CHECK(r.status == 4);
    CHECK(r.err == "plumb: the user id or password is wrong (user lea).\n");
  }
  // Now even the right password is refused until an administrator unlocks the account.
  auto r = as_user(db, "lea", first, {"login"}, dir);
  CHECK(r.status == 4);
  CHECK(r.err.find("the account lea is locked after 3 failed log-ins") != std::string::npos);
  CHECK(plumb::test::sqlite_shell(
            db,
            "SELECT event FROM account_events WHERE user_id = (SELECT id FROM users WHERE login = 'lea') AND "
            "event IN ('failed log-in', 'locked') ORDER BY id") ==
        "failed log-in\nfailed log-in\nfailed log-in\nlocked\n");
  REQUIRE(
      as_user(db, "test-admin", admin_pw, {"user", "unlock", "lea", "--reason", "identity confirmed"}, dir).status ==
      0);
  r = as_user(db, "lea", first, {"login"}, dir);
  CHECK(r.status == 4);  // unlocked; now the forced change of a first password applies
  CHECK(r.err.find("must be changed before anything else") != std::string::npos);
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);
}

TEST_CASE("an administrator's password reset forces a change, so the administrator cannot sign as the user",
          "[people][signatures]") {
  ScratchDir dir;
  const auto db = lab_with_certificate(dir);
  const auto admin_pw = dir.file(".plumb-test-password").string();
  // "Q. Manager" is a test member (reviewer); the administrator resets its password to one it knows.
  REQUIRE(run_plumb({"--db", db, "user", "list", "--as", "Q. Manager"}, dir.path()).status == 0);
  const std::string manager = plumb::test::test_login("Q. Manager");
  const auto temporary = secret_file(dir, "temp.pw", "temporary password 42");
  REQUIRE(
      as_user(db, "test-admin", admin_pw, {"user", "reset-password", manager, "--new-password-file", temporary}, dir)
          .status == 0);
  auto r = as_user(db, manager, temporary, {"certificate", "approve", "1", "--meaning", "reviewed and approved"}, dir);
  CHECK(r.status == 4);
  CHECK(r.err.find("was set by an administrator and must be changed before anything else") != std::string::npos);
  CHECK(plumb::test::sqlite_shell(db, "SELECT count(*) FROM certificate_events") == "0\n");
  // The user changes it; then the approval goes through, signed by that user.
  const auto own = secret_file(dir, "own.pw", "the manager's own password");
  REQUIRE(as_user(db, manager, temporary, {"user", "password", "--new-password-file", own}, dir).status == 0);
  r = as_user(db, manager, own, {"certificate", "approve", "1", "--meaning", "reviewed and approved"}, dir);
  INFO(r.err);
  CHECK(r.status == 0);
}

TEST_CASE("a session: token file 0600, only its SHA-256 stored, ends at logout or after the lab's idle time",
          "[people][files]") {
  ScratchDir dir;
  const auto db = lab_with_certificate(dir);
  const std::string manager = plumb::test::test_login("Q. Manager");
  REQUIRE(run_plumb({"--db", db, "user", "list", "--as", "Q. Manager"}, dir.path()).status == 0);
  const auto pw = dir.file(".plumb-test-password").string();
  // Log in with the password on standard input (never on the command line).
  auto r = run_plumb({"--db", db, "--password-stdin", "login", "--user", manager}, dir.path(),
                     std::string(plumb::test::test_password) + "\n");
  INFO(r.err);
  REQUIRE(r.status == 0);
  const auto sessions = dir.path() / ".plumb-state" / "plumb" / "sessions";
  CHECK(mode_of(sessions) == 0700);
  std::filesystem::path token_file;
  for (const auto& e : std::filesystem::directory_iterator(sessions)) token_file = e.path();
  REQUIRE(!token_file.empty());
  CHECK(mode_of(token_file) == 0600);
  std::ifstream in(token_file);
  std::string token;
  std::getline(in, token);
  CHECK(token.size() == 64);
  CHECK(plumb::test::sqlite_shell(db, "SELECT count(*) FROM sessions WHERE token_sha256 = '" + token + "'") == "0\n");
  CHECK(plumb::test::sqlite_shell(db, "SELECT count(*) FROM sessions") == "1\n");
  // --user with --password-stdin is what this test passes; a session alone runs a command that writes ...
  r = run_plumb({"--db", db, "--password-stdin", "certificate", "issue", "1"}, dir.path(), "\n");
  CHECK(r.status == 0);
  // ... but signing needs the password again even with a session (11.200(a)(1)(i)).
  r = run_plumb({"--db", db, "--password-stdin", "certificate", "approve", "1", "--meaning", "reviewed"}, dir.path(),
                "");
  CHECK(r.status == 4);
  CHECK(r.err.find("wrong") != std::string::npos);
  r = run_plumb({"--db", db, "--password-file", pw, "certificate", "approve", "1", "--meaning", "reviewed"},
                dir.path());
  INFO(r.err);
  CHECK(r.status == 0);
  // Idle past the lab's limit (the last use moved two hours back): the session has ended.
  REQUIRE(std::system(
              ("sqlite3 '" + db + "' \"UPDATE session_activity SET last_used_at = '2000-01-01T00:00:00Z'\"").c_str()) ==
          0);
  r = run_plumb({"--db", db, "--password-stdin", "certificate", "issue", "1"}, dir.path(), "\n");
  CHECK(r.status == 4);
  CHECK(r.err.find("ended after more than 15 minutes idle") != std::string::npos);
  CHECK(plumb::test::sqlite_shell(db, "SELECT why FROM session_ends") == "idle\n");
  r = run_plumb({"--db", db, "--password-stdin", "logout"}, dir.path(), "");
  CHECK(r.status == 0);
  CHECK(!std::filesystem::exists(token_file));
}

TEST_CASE("a password file that others can read is refused, and --by is refused with a sentence to log in",
          "[people]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("open.pw", std::string(plumb::test::test_password) + "\n");
  ::chmod(dir.file("open.pw").c_str(), 0644);
  auto r = as_user(db, "test-admin", dir.file("open.pw").string(), {"login"}, dir);
  CHECK(r.status == 2);
  CHECK(r.err.find("has mode 0644 or another owner; it must be readable by its owner only") != std::string::npos);
  r = run_plumb({"--db", db, "balance", "add", "BAL-Z", "--capacity", "220g", "--readability", "0.1mg", "--every", "7d",
                 "--by", "Q. Manager"},
                dir.path());
  CHECK(r.status == 2);
  CHECK(r.err.find("--by is gone: plumb records the logged-in user") != std::string::npos);
}

TEST_CASE("a signature holds the signer's id, printed name, UTC time, meaning and the SHA-256 of what was signed",
          "[signatures]") {
  ScratchDir dir;
  const auto db = lab_with_certificate(dir);
  auto r =
      run_plumb({"--db", db, "certificate", "approve", "1", "--meaning", "reviewed and approved", "--as", "Q. Manager"},
                dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const auto row = plumb::test::sqlite_shell(
      db,
      "SELECT s.user_id = u.id, s.printed_name, s.meaning, s.table_name, s.row_key, "
      "s.signed_at GLOB '[0-9][0-9][0-9][0-9]-[0-9][0-9]-[0-9][0-9]T[0-9][0-9]:[0-9][0-9]:[0-9][0-9]Z' "
      "FROM signatures s JOIN users u ON u.full_name = 'Q. Manager'");
  CHECK(row == "1|Q. Manager|reviewed and approved|certificates|id=1|1\n");
  // The signed SHA-256 is that of the certificate's record in the trail, computed here by sqlite3's own
  // SHA-256 is not available, so with sha256sum (GNU coreutils) over the stored after_json.
  const std::string content =
      plumb::test::sqlite_shell(db,
                                "SELECT after_json FROM audit_log WHERE table_name = 'certificates' AND "
                                "row_key = 'id=1'");
  dir.write("signed.txt", content.substr(0, content.size() - 1));
  REQUIRE(std::system(("sha256sum '" + dir.file("signed.txt").string() + "' | cut -c1-64 > '" +
                       dir.file("sum.txt").string() + "'")
                          .c_str()) == 0);
  std::ifstream sum(dir.file("sum.txt"));
  std::string expected;
  std::getline(sum, expected);
  CHECK(plumb::test::sqlite_shell(db, "SELECT signed_sha256 FROM signatures") == expected + "\n");
  // Every rendering reads the stored status: JSON has the signature, text names it.
  r = run_plumb({"--db", db, "certificate", "show", "1", "--format", "json"}, dir.path());
  const json doc = json::parse(r.out);
  REQUIRE(doc["status"]["signatures"].size() == 1);
  CHECK(doc["status"]["signatures"][0]["name"] == "Q. Manager");
  CHECK(doc["status"]["signatures"][0]["meaning"] == "reviewed and approved");
  // The signer's function: the roles that allowed the approval, as held when signing (the helper's members hold
  // technician, reviewer and quality manager).
  CHECK(doc["status"]["signatures"][0]["function"] == "reviewer and quality manager");
  const std::string at = doc["status"]["signatures"][0]["at"].get<std::string>();
  r = run_plumb({"--db", db, "certificate", "show", "1"}, dir.path());
  CHECK_THAT(r.out, Catch::Contains("Q. Manager (reviewer and quality manager)") &&
                        Catch::Contains("signed electronically on " + at) && Catch::Contains("reviewed and approved"));
}

TEST_CASE("a signature moved to another record, or signed content changed, makes audit verify fail", "[signatures]") {
  ScratchDir dir;
  const auto db = lab_with_certificate(dir);
  dir.write("ok.csv", passing_readings);
  REQUIRE(run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "ok.csv", "--on",
                     "2026-11-09", "--as", "A. Technician"},
                    dir.path())
              .status == 0);
  REQUIRE(run_plumb({"--db", db, "certificate", "issue", "2", "--as", "A. Technician"}, dir.path()).status == 0);
  REQUIRE(
      run_plumb({"--db", db, "certificate", "approve", "1", "--meaning", "reviewed and approved", "--as", "Q. Manager"},
                dir.path())
          .status == 0);
  REQUIRE(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);
  // Moved: the signature now names certificate 2.
  const std::string moved = dir.file("moved.db").string();
  std::filesystem::copy_file(db, moved);
  REQUIRE(std::system(("sqlite3 '" + moved +
                       "' \"DROP TRIGGER signatures_no_update; UPDATE signatures SET row_key = "
                       "'id=2'\"")
                          .c_str()) == 0);
  auto r = run_plumb({"--db", moved, "audit", "verify", "--all"}, dir.path());
  CHECK(r.status == 1);
  CHECK(r.out.find("signature 1 (Q. Manager") != std::string::npos);
  CHECK(r.out.find("no longer matches certificates id=2") != std::string::npos);
}
