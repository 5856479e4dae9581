// Crash consistency: `check import` is killed with SIGKILL at random moments (fixed seed). After each kill
// the database must pass PRAGMA integrity_check, hold either none or all of the import, and keep an audit
// chain that verifies; an interrupted import can then simply be run again.
#include <SQLiteCpp/Database.h>
#include <fcntl.h>
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <catch2/catch.hpp>
#include <chrono>
#include <random>
#include <thread>

#include "support/audit_chain.hpp"
#include "support/paths.hpp"
#include "support/run_plumb.hpp"

namespace {

constexpr int trials = 30;
constexpr int runs = 3000;  // x 10 readings: more than the page cache holds, so the WAL fills mid-import

/// Starts plumb, logged in with `login` (plumb::test::login_options), with output discarded; returns its process id.
pid_t spawn_plumb(const std::vector<std::string>& login, const std::vector<std::string>& args) {
  std::vector<std::string> all = {plumb::test::plumb_binary().string()};
  all.insert(all.end(), login.begin(), login.end());
  all.insert(all.end(), args.begin(), args.end());
  std::vector<char*> argv;
  for (auto& a : all) argv.push_back(a.data());
  argv.push_back(nullptr);
  const pid_t pid = fork();
  if (pid == 0) {
    const int null = open("/dev/null", O_WRONLY);
    dup2(null, 1);
    dup2(null, 2);
    execv(argv[0], argv.data());
    _exit(127);
  }
  return pid;
}

struct Counts {
  long long runs = 0, readings = 0, batches = 0, audit = 0;
  friend bool operator==(const Counts&, const Counts&) = default;
};

Counts counts(const std::filesystem::path& db) {
  SQLite::Database sql(db.string(), SQLite::OPEN_READWRITE);  // read-write so that a hot WAL is recovered
  Counts c;
  c.runs = sql.execAndGet("SELECT count(*) FROM check_runs").getInt64();
  c.readings = sql.execAndGet("SELECT count(*) FROM readings").getInt64();
  c.batches = sql.execAndGet("SELECT count(*) FROM import_batches").getInt64();
  c.audit = sql.execAndGet("SELECT count(*) FROM audit_log").getInt64();
  return c;
}

std::string integrity(const std::filesystem::path& db) {
  SQLite::Database sql(db.string(), SQLite::OPEN_READWRITE);
  return sql.execAndGet("PRAGMA integrity_check").getString();
}

void copy_database(const std::filesystem::path& from, const std::filesystem::path& to) {
  // The lab's signing key goes with the copy (DB.key beside it), or the copy could not be written to.
  for (const char* suffix : {"", "-wal", "-shm", ".key"}) {
    std::filesystem::remove(to.string() + suffix);
    if (std::filesystem::exists(from.string() + suffix))
      std::filesystem::copy_file(from.string() + suffix, to.string() + suffix);
  }
}

}  // namespace

TEST_CASE("crash consistency: check import killed at random moments is all or nothing", "[cli][crash]") {
  plumb::test::ScratchDir dir;
  const auto lab = plumb::test::example_lab(dir);
  // Runs labelled r1..rN on dates after W100's certificate (2026-03-02), 10 passing readings each.
  std::string csv = "run,instrument,procedure,date,operator,weight,reading,unit\n";
  for (int r = 1; r <= runs; ++r)
    for (int i = 0; i < 10; ++i)
      csv += "r" + std::to_string(r) + ",BAL-A,repeatability,2026-" + (r % 8 + 3 < 10 ? "0" : "") +
             std::to_string(r % 8 + 3) + "-1" + std::to_string(r % 10) + ",A. Technician,W100,100.000" +
             std::to_string(1 + (i + r) % 4) + ",g\n";
  dir.write("history.csv", csv);
  // The importing member's account is made first, so every copy below has it and "before" includes it.
  const auto login = plumb::test::login_options(lab, "Lab Tester", dir.path());
  REQUIRE(login.size() == 4);
  const Counts before = counts(lab);

  // One complete import, timed, gives the "all" state and the window to kill in.
  const auto full = dir.file("full.db");
  copy_database(lab, full);
  const auto t0 = std::chrono::steady_clock::now();
  const pid_t whole = spawn_plumb(login, {"--db", full.string(), "check", "import", dir.file("history.csv").string()});
  int whole_status = -1;
  waitpid(whole, &whole_status, 0);
  const auto window_us =
      std::chrono::duration_cast<std::chrono::microseconds>(std::chrono::steady_clock::now() - t0).count();
  REQUIRE(WIFEXITED(whole_status));
  REQUIRE(WEXITSTATUS(whole_status) == 0);
  const Counts after = counts(full);
  REQUIRE(after.runs == before.runs + runs);
  REQUIRE(after.readings == before.readings + 10 * runs);
  REQUIRE(after.batches == before.batches + 1);

  std::mt19937 rng(20261202);
  std::uniform_int_distribution<long long> moment(0, window_us + window_us / 4);
  int none = 0, all = 0, mid_write = 0;
  for (int t = 0; t < trials; ++t) {
    const auto db = dir.file("trial.db");
    copy_database(lab, db);
    const pid_t pid = spawn_plumb(login, {"--db", db.string(), "check", "import", dir.file("history.csv").string()});
    REQUIRE(pid > 0);
    std::this_thread::sleep_for(std::chrono::microseconds(moment(rng)));
    kill(pid, SIGKILL);
    int status = 0;
    waitpid(pid, &status, 0);

    INFO("trial " << t);
    // Uncommitted pages in the write-ahead log show that the kill landed while the import was writing.
    const auto wal = std::filesystem::path(db.string() + "-wal");
    if (std::filesystem::exists(wal) && std::filesystem::file_size(wal) > 0) ++mid_write;
    CHECK(integrity(db) == "ok");
    const Counts now = counts(db);
    CHECK((now == before || now == after));
    if (now == before) ++none;
    if (now == after) ++all;
    const auto audit = plumb::test::check_audit_chain(db);
    CHECK(audit.problem.empty());
    CHECK(audit.rows == now.audit);

    // Every fifth trial: running the import again completes it, or refuses it when it had committed.
    if (t % 5 == 4) {
      const auto again = plumb::test::run_plumb(
          {"--db", db.string(), "check", "import", dir.file("history.csv").string()}, dir.path());
      CHECK(again.status == (now == after ? 2 : 0));
      CHECK(counts(db) == after);
      CHECK(plumb::test::check_audit_chain(db).problem.empty());
    }
  }
  INFO("killed before commit " << none << " (" << mid_write << " while writing), after " << all);
  CHECK(none + all == trials);
  // The kills must often land while the import is writing, or the test proves little.
  CHECK(mid_write >= trials / 3);
}
