// Concurrency: two processes record 200 checks each at the same time while a third reads the due list in a
// loop. Every record must land, no "database is locked" (or any other error) may reach a user, and the
// audit chain must stay contiguous.
#include <SQLiteCpp/Database.h>

#include <catch2/catch.hpp>
#include <fstream>
#include <sstream>

#include "support/audit_chain.hpp"
#include "support/paths.hpp"
#include "support/run_plumb.hpp"

namespace {

constexpr int per_writer = 200;
constexpr int readings_per_run = 10;  // USP <41> asks for not less than 10 replicate weighings

std::string slurp(const std::filesystem::path& p) {
  std::ifstream in(p);
  std::stringstream s;
  s << in.rdbuf();
  return s.str();
}

// The writers log in as members of their own (made before the race): the password file and both user ids, as the
// script's 4th to 6th arguments.
std::string writers_login(const std::filesystem::path& db, const std::filesystem::path& dir) {
  std::string out;
  const auto a = plumb::test::login_options(db, "Writer BAL-A", dir);
  const auto b = plumb::test::login_options(db, "Writer BAL-B", dir);
  REQUIRE(a.size() == 4);
  REQUIRE(b.size() == 4);
  return " '" + a[3] + "' '" + a[1] + "' '" + b[1] + "'";
}

}  // namespace

TEST_CASE("concurrency: two writers and a reader never see a locked database", "[cli][concurrency]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir);
  REQUIRE(plumb::test::run_plumb({"--db", db.string(), "balance", "add", "BAL-B", "--capacity", "220g", "--readability",
                                  "0.1mg", "--every", "7d", "--smallest-net", "200mg"},
                                 dir.path())
              .status == 0);
  dir.write("r.csv",
            "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n"
            "100.0003\n100.0002\n");
  dir.write("race.sh", R"(set -u
plumb="$1"; db="$2"; n="$3"; password="$4"
writer() {
  for i in $(seq 1 "$n"); do
    "$plumb" --db "$db" --user "$2" --password-file "$password" check record "$1" --weight W100 --readings r.csv \
      --on 2026-11-30 \
      >/dev/null 2>>"err-$1.txt" || echo "$i" >>"failed-$1.txt"
  done
}
reader() {
  reads=0
  while [ ! -e writers.done ]; do
    "$plumb" --db "$db" due --all --on 2026-12-01 >/dev/null 2>>err-reader.txt || echo x >>failed-reader.txt
    reads=$((reads + 1))
  done
  echo "$reads" >reads.txt
}
reader & r=$!
writer BAL-A "$5" & a=$!
writer BAL-B "$6" & b=$!
wait "$a" "$b"
touch writers.done
wait "$r"
)");
  const std::string logins = writers_login(db, dir.path());  // the writers' accounts, before they are counted
  const auto accounts_before = plumb::test::account_records(db);
  const std::string cmd = "cd '" + dir.path().string() + "' && bash race.sh '" + plumb::test::plumb_binary().string() +
                          "' '" + db.string() + "' " + std::to_string(per_writer) + logins;
  REQUIRE(std::system(cmd.c_str()) == 0);

  for (const char* who : {"BAL-A", "BAL-B", "reader"}) {
    INFO(who);
    CHECK(slurp(dir.file(std::string("err-") + who + ".txt")).empty());
    CHECK_FALSE(std::filesystem::exists(dir.file(std::string("failed-") + who + ".txt")));
  }
  CHECK(std::stoi(slurp(dir.file("reads.txt"))) >= 1);
  SQLite::Database sql(db.string(), SQLite::OPEN_READONLY);
  CHECK(sql.execAndGet("SELECT count(*) FROM check_runs WHERE instrument_id = 'BAL-A'").getInt() == per_writer);
  CHECK(sql.execAndGet("SELECT count(*) FROM check_runs WHERE instrument_id = 'BAL-B'").getInt() == per_writer);
  CHECK(sql.execAndGet("SELECT count(*) FROM readings").getInt() == 2 * per_writer * readings_per_run);
  const auto audit = plumb::test::check_audit_chain(db);
  CHECK(audit.problem.empty());
  // Registry: lab 1, weight and certificate 2, two balances 2 x 2; then one record per run (the run, its weight
  // and its 10 readings together); besides them the test helper's accounts (the writers' among them), which the
  // race itself does not add to.
  CHECK(plumb::test::account_records(db) == accounts_before);
  CHECK(audit.rows == 7 + 2 * per_writer + accounts_before);
}

// audit verify reads one snapshot: while two writers record checks, every verification in a loop must pass (before
// it read in one transaction, 5 runs in 8 reported a run "written outside plumb"). Bounded: 12 checks a writer.
TEST_CASE("concurrency: audit verify never reports a false difference while two writers record checks",
          "[cli][concurrency][audit]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir);
  REQUIRE(plumb::test::run_plumb({"--db", db.string(), "balance", "add", "BAL-B", "--capacity", "220g", "--readability",
                                  "0.1mg", "--every", "7d", "--smallest-net", "200mg"},
                                 dir.path())
              .status == 0);
  dir.write("r.csv",
            "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n"
            "100.0003\n100.0002\n");
  dir.write("verify-race.sh", R"(set -u
plumb="$1"; db="$2"; n="$3"; password="$4"
writer() {
  for i in $(seq 1 "$n"); do
    "$plumb" --db "$db" --user "$2" --password-file "$password" check record "$1" --weight W100 --readings r.csv \
      --on 2026-11-30 \
      >/dev/null 2>>"err-$1.txt" || echo "$i" >>"failed-$1.txt"
  done
}
verifier() {
  runs=0
  while [ ! -e writers.done ]; do
    "$plumb" --db "$db" audit verify >/dev/null 2>>err-verify.txt || echo x >>failed-verify.txt
    runs=$((runs + 1))
  done
  echo "$runs" >verifies.txt
}
verifier & v=$!
writer BAL-A "$5" & a=$!
writer BAL-B "$6" & b=$!
wait "$a" "$b"
touch writers.done
wait "$v"
)");
  const std::string logins = writers_login(db, dir.path());
  const int checkpoints_before =
      SQLite::Database(db.string(), SQLite::OPEN_READONLY).execAndGet("SELECT count(*) FROM checkpoints").getInt();
  const std::string cmd = "cd '" + dir.path().string() + "' && bash verify-race.sh '" +
                          plumb::test::plumb_binary().string() + "' '" + db.string() + "' 12" + logins;
  REQUIRE(std::system(cmd.c_str()) == 0);
  for (const char* who : {"BAL-A", "BAL-B", "verify"}) {
    INFO(who << ": " << slurp(dir.file(std::string("err-") + who + ".txt")));
    CHECK_FALSE(std::filesystem::exists(dir.file(std::string("failed-") + who + ".txt")));
  }
  CHECK(std::stoi(slurp(dir.file("verifies.txt"))) >= 2);
  SQLite::Database sql(db.string(), SQLite::OPEN_READONLY);
  CHECK(sql.execAndGet("SELECT count(*) FROM check_runs").getInt() == 24);
  // Every command signed its own checkpoint: each of the 24 checks one more than the lab, its balances and the
  // helper's accounts had before the race.
  CHECK(sql.execAndGet("SELECT count(*) FROM checkpoints").getInt() == checkpoints_before + 24);
}
