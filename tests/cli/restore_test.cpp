// Restoring a backup through the built binary: the restore is recorded in the restored trail (which backup, its
// last audit hash, who, why, what it removed), another lab's database is not replaced without being asked in so
// many words, and safety copies never overwrite each other and are readable by their owner only.
#include <SQLiteCpp/Database.h>
#include <SQLiteCpp/Statement.h>

#include <catch2/catch.hpp>

#include <sys/stat.h>

#include <chrono>
#include <cstdlib>
#include <fstream>
#include <nlohmann/json.hpp>
#include <regex>

#include "support/audit_chain.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::run_plumb;
namespace fs = std::filesystem;

namespace {

std::vector<std::string> add_weight(const std::string& db, const std::string& id, const std::string& nominal) {
  return {"--db",       db,
          "weight",     "add",
          id,           "--nominal",
          nominal,      "--class",
          "F1",         "--uncertainty",
          "0.03mg",     "--certificate",
          "C-" + id,    "--calibrated",
          "2026-01-10", "--due",
          "2027-01-10"};
}

std::string last_hash_of_backup(const std::string& out) {
  std::smatch m;
  const std::regex last("Last hash: ([0-9a-f]{64})");
  REQUIRE(std::regex_search(out, m, last));
  return m[1];
}

unsigned mode_of(const fs::path& p) {
  struct stat st {};
  REQUIRE(::stat(p.c_str(), &st) == 0);
  return st.st_mode & 0777U;
}

std::vector<fs::path> safety_copies(const plumb::test::ScratchDir& dir) {
  std::vector<fs::path> out;
  for (const auto& e : fs::directory_iterator(dir.path()))
    if (e.path().filename().string().find(".before-restore-") != std::string::npos) out.push_back(e.path());
  std::sort(out.begin(), out.end());
  return out;
}

std::string slurp(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  return {std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
}

}  // namespace

TEST_CASE("a restore is recorded in the restored trail with what it removed", "[cli][backup]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();  // lab, W100 and its certificate, BAL-A: 5 records
  // Besides them the test helper's accounts, Q. Manager's made now: the one who restores is in the backup too.
  plumb::test::prepare_login({"--db", db, "weight", "list", "--as", "Q. Manager"}, dir.path());
  const long long accounts = plumb::test::account_records(db);
  const auto n = [&](long long lab_records) { return std::to_string(lab_records + accounts); };
  auto r = run_plumb({"--db", db, "backup", "copy.db"}, dir.path());
  REQUIRE(r.status == 0);
  const std::string backup_hash = last_hash_of_backup(r.out);
  // After the backup: two weights (a weight and its certificate each) and one retirement: 5 records.
  REQUIRE(run_plumb(add_weight(db, "W1", "1g"), dir.path()).status == 0);
  REQUIRE(run_plumb(add_weight(db, "W2", "2g"), dir.path()).status == 0);
  REQUIRE(run_plumb({"--db", db, "weight", "retire", "W2", "--reason", "chipped", "--as", "Q. Manager"}, dir.path())
              .status == 0);

  r = run_plumb({"--db", db, "restore", "copy.db", "--force", "--reason", "lab PC disk failed", "--as", "Q. Manager"},
                dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("The restore removes 5 records recorded after the backup") &&
                        Catch::Contains("1 in service_events") && Catch::Contains("2 in weight_calibrations") &&
                        Catch::Contains("2 in weights") &&
                        Catch::Contains("(" + n(10) + " audit records) was saved as"));
  // The restored database: the backup's records and the record of the restore; W1 and W2 are gone.
  CHECK_THAT(r.out, Catch::Contains(n(6) + " audit records"));
  CHECK(run_plumb({"--db", db, "weight", "show", "W1"}, dir.path()).status == 2);
  r = run_plumb({"--db", db, "audit", "verify"}, dir.path());
  INFO(r.out << r.err);
  CHECK(r.status == 0);

  r = run_plumb({"--db", db, "audit", "log", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json records = json::parse(r.out)["records"];
  REQUIRE(records.size() == static_cast<std::size_t>(6 + accounts));
  const json& restore = records[static_cast<std::size_t>(5 + accounts)];
  CHECK(restore["table"] == "restores");
  CHECK(restore["actor"] == "Q. Manager");
  CHECK(restore["reason"] == "lab PC disk failed");
  CHECK(restore["prev_hash"] == backup_hash);  // chained onto the backup's last record
  const json& row = restore["after"];
  CHECK(row["backup_last_hash"] == backup_hash);
  CHECK(row["backup_records"] == 5 + accounts);
  CHECK(row["replaced_records"] == 10 + accounts);
  CHECK(row["common_records"] == 5 + accounts);
  CHECK(row["removed_records"] == 5);
  CHECK(row["backup_file"] == (dir.path() / "copy.db").lexically_normal().string());
  CHECK(row["backup_sha256"].get<std::string>().size() == 64);
  CHECK(row["safety_copy"].get<std::string>().find(".before-restore-") != std::string::npos);

  // A reason is required, and must say something.
  r = run_plumb({"--db", db, "restore", "copy.db", "--force"}, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("--reason"));
}

TEST_CASE("restore refuses to replace another lab's database unless told so", "[cli][backup]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();  // "Example Analytical Lab"
  REQUIRE(run_plumb({"--db", "other.db", "init", "--lab", "Birch Hollow Water Lab"}, dir.path()).status == 0);
  REQUIRE(run_plumb({"--db", "other.db", "backup", "other-copy.db"}, dir.path()).status == 0);
  const std::string before = plumb::test::dump_database(db);
  auto r = run_plumb({"--db", db, "restore", "other-copy.db", "--force", "--reason", "wrong stick"}, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("\"Birch Hollow Water Lab\"") && Catch::Contains("\"Example Analytical Lab\"") &&
                        Catch::Contains("--other-lab"));
  CHECK(plumb::test::dump_database(db) == before);
  CHECK(safety_copies(dir).empty());

  // Told so, but the other lab's records are signed with its own key: this lab's key cannot go on signing them.
  const std::vector<std::string> merge = {
      "--db", db, "restore", "other-copy.db", "--force", "--other-lab", "--reason", "site merged into Birch Hollow"};
  r = run_plumb(merge, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("set PLUMB_KEY to the file of the backup's key"));
  CHECK(plumb::test::dump_database(db) == before);
  // With the other lab's key: its records replace these, every one of them counted as removed.
  const long long accounts = plumb::test::account_records(db);
  // The two test administrators' first records are the same record when both labs were made in the same second:
  // the trails then share that beginning, and it is not removed.
  long long shared = 0;
  {
    SQLite::Database mine(db, SQLite::OPEN_READONLY), theirs(dir.file("other.db").string(), SQLite::OPEN_READONLY);
    SQLite::Statement a(mine, "SELECT hash FROM audit_log ORDER BY seq"),
        b(theirs, "SELECT hash FROM audit_log ORDER BY seq");
    while (a.executeStep() && b.executeStep() && a.getColumn(0).getString() == b.getColumn(0).getString()) ++shared;
  }
  ::setenv("PLUMB_KEY", (dir.path() / "other.db.key").c_str(), 1);
  r = run_plumb(merge, dir.path());
  const auto verified = run_plumb({"--db", db, "audit", "verify"}, dir.path());
  ::unsetenv("PLUMB_KEY");
  INFO(r.err);
  REQUIRE(r.status == 0);
  // The trails share no lab record: the 5 of the lab and the helper's accounts go, all but a shared beginning.
  CHECK_THAT(r.out, Catch::Contains("removes " + std::to_string(5 + accounts - shared) + " records"));
  CHECK(verified.status == 0);
  r = run_plumb({"--db", db, "weight", "list", "--format", "json"}, dir.path());
  CHECK(json::parse(r.out).empty());
}

TEST_CASE("safety copies of restores in the same second get names of their own, mode 0600", "[cli][backup]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  REQUIRE(run_plumb({"--db", db, "backup", "copy.db"}, dir.path()).status == 0);
  CHECK(mode_of(dir.file("copy.db")) == 0600U);
  // Occupy the names of the next seconds, so that both restores below meet a name that is taken, as two restores
  // within one second do.
  const auto now = std::chrono::system_clock::now();
  std::vector<fs::path> taken;
  for (int s = 0; s < 30; ++s) {
    const auto t = std::chrono::system_clock::to_time_t(now + std::chrono::seconds(s));
    char stamp[32];
    std::strftime(stamp, sizeof stamp, "%Y%m%dT%H%M%SZ", std::gmtime(&t));
    taken.push_back(db + ".before-restore-" + stamp);
    std::ofstream(taken.back()) << "an earlier safety copy " << s;
  }
  for (int i = 0; i < 2; ++i) {
    const auto r = run_plumb({"--db", db, "restore", "copy.db", "--force", "--reason", "drill"}, dir.path());
    INFO(r.err);
    REQUIRE(r.status == 0);
  }
  for (std::size_t s = 0; s < taken.size(); ++s)
    CHECK(slurp(taken[s]) == "an earlier safety copy " + std::to_string(s));  // none overwritten
  const auto copies = safety_copies(dir);
  REQUIRE(copies.size() == taken.size() + 2);
  std::vector<fs::path> made;
  for (const auto& c : copies)
    if (std::find(taken.begin(), taken.end(), c) == taken.end()) made.push_back(c);
  REQUIRE(made.size() == 2);
  for (const auto& m : made) {
    CHECK(mode_of(m) == 0600U);
    CHECK(std::regex_search(m.string(), std::regex("Z-[0-9]+$")));                      // a taken name with a counter
    CHECK(run_plumb({"--db", m.string(), "audit", "verify"}, dir.path()).status == 0);  // a whole database
  }
  // A database restored where there was none is the owner's only, too (the lab's key comes along to sign it).
  fs::copy_file(dir.file("lab.db.key"), dir.file("new.db.key"));
  // Nobody has an account in a database that is not there yet: the one restoring logs in with the backup's accounts.
  std::vector<std::string> restore = plumb::test::login_options(dir.file("copy.db"), "Lab Tester", dir.path());
  REQUIRE(restore.size() == 4);
  restore.insert(restore.end(), {"--db", "new.db", "restore", "copy.db", "--reason", "new lab PC"});
  const auto restored = run_plumb(restore, dir.path());
  INFO(restored.err);
  REQUIRE(restored.status == 0);
  CHECK(mode_of(dir.file("new.db")) == 0600U);
}
