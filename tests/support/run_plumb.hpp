#pragma once
// Runs the built plumb binary in a scratch folder, as a user would, and captures what it prints.
#include <filesystem>
#include <string>
#include <vector>

namespace plumb::test {

struct RunResult {
  int status = -1;
  std::string out;
  std::string err;
};

/// A fresh temporary folder, removed when the object goes.
class ScratchDir {
 public:
  ScratchDir();
  ~ScratchDir();
  ScratchDir(const ScratchDir&) = delete;
  ScratchDir& operator=(const ScratchDir&) = delete;
  [[nodiscard]] const std::filesystem::path& path() const { return path_; }
  [[nodiscard]] std::filesystem::path file(const std::string& name) const { return path_ / name; }
  void write(const std::string& name, const std::string& text) const;

 private:
  std::filesystem::path path_;
};

/// Runs `plumb args...` with the working directory `cwd`; `input` goes to standard input.
///
/// Log-in for tests, in this one place: every command on an existing database (`--db PATH`) runs authenticated
/// as a lab member, `--user LOGIN --password-file FILE` added in front (the file, mode 0600, is in `cwd`). `"--as",
/// "NAME"` anywhere in `args` (taken out before plumb sees it) chooses the member by full name; without it the
/// member is "Lab Tester". A member is created on first use, by the test administrator, with the roles technician,
/// reviewer and quality manager, and its first password changed as plumb requires; "Test Administrator" is the
/// administrator itself. `init` without `--admin` gets `--admin test-admin --admin-name "Test Administrator"`.
/// Arguments that already hold --user, --password-file or --password-stdin are left alone (tests of log-in).
/// Every run has PLUMB_TEST_ONLY_FAST_PASSWORD_HASHING=1 (databases created by tests hash with libsodium's minimum
/// limits) and XDG_STATE_HOME=<cwd>/.plumb-state (session files stay in the scratch folder).
RunResult run_plumb(const std::vector<std::string>& args, const std::filesystem::path& cwd,
                    const std::string& input = "");

/// The member of a `--as` name (or "Lab Tester"), created in the database of `args` if missing: what run_plumb
/// does before running, for a caller that must compare the database before and after the command itself.
void prepare_login(const std::vector<std::string>& args, const std::filesystem::path& cwd);

/// The options that log `member` in to `db` (created there if missing), for a script that starts plumb itself:
/// {"--user", LOGIN, "--password-file", FILE}; empty when `db` has no test administrator to create it with.
std::vector<std::string> login_options(const std::filesystem::path& db, const std::string& member,
                                       const std::filesystem::path& cwd);

/// The user id (login) a test member's full name gets: "A. Technician" -> "a-technician-1b2c3d4e".
std::string test_login(const std::string& full_name);
/// The password of every test member and of the test administrator (in `cwd`/.plumb-test-password).
inline constexpr const char* test_password = "test-password-for-plumb";
/// The shell command that runs `plumb args...` in `cwd` as run_plumb does, logged in the same way (for a terminal
/// multiplexer to run it).
std::string plumb_shell_command(const std::vector<std::string>& args, const std::filesystem::path& cwd);

/// A plumb started and left running (a capture the test feeds, interrupts or cuts off), with the working directory
/// `cwd`, logged in as run_plumb does. Each of stdin / stdout / stderr is the descriptor given, or a file in `cwd`
/// (.stdin holding `input`, .stdout, .stderr). With `terminal`, the child starts a session whose controlling terminal
/// is `stdin_fd` (a pseudo-terminal's slave), so Ctrl-C typed on it interrupts plumb as at a real terminal.
class PlumbProcess {
 public:
  PlumbProcess(const std::vector<std::string>& args, const std::filesystem::path& cwd, const std::string& input = "",
               int stdin_fd = -1, int stdout_fd = -1, bool terminal = false);
  ~PlumbProcess();
  PlumbProcess(const PlumbProcess&) = delete;
  PlumbProcess& operator=(const PlumbProcess&) = delete;
  [[nodiscard]] int pid() const { return pid_; }
  /// What plumb has printed to its .stdout file so far.
  [[nodiscard]] std::string output_so_far() const;
  /// Waits until plumb's .stdout holds `text` (at most `seconds`; then throws, with what it printed).
  void wait_for_output(const std::string& text, int seconds = 10) const;
  /// Sends `signal` to plumb.
  void signal(int signal) const;
  /// Waits for plumb to end (at most `seconds`, then kills it and fails); the status and what it printed to files.
  RunResult wait(int seconds = 20);

 private:
  std::filesystem::path cwd_;
  int pid_ = -1;
  bool waited_ = false;
};

/// `sqlite3 DB .dump`: the whole content of a database as SQL text, for before/after comparison.
std::string dump_database(const std::filesystem::path& db);

/// What the sqlite3 shell prints for `sql` on `db` (rows as `a|b`, one per line): SQLite's own view of a database,
/// independent of plumb's code.
std::string sqlite_shell(const std::filesystem::path& db, const std::string& sql);

/// Sets up the lab of the weekly-check example: lab, W100 and BAL-A. Returns the database path.
std::filesystem::path example_lab(const ScratchDir& dir);

/// The example lab with SM-02 (120 g, d = 0.01 mg, Weighing room), the balance of the pipette examples, and its
/// passing weekly check with W100 on 2026-11-30 by A. Technician (tests/cli/pipette_check_test.cpp). Returns the
/// database path.
std::filesystem::path pipette_balance_lab(const ScratchDir& dir);

/// The lab of the calibration example (tests/cli/calibration_test.cpp): BAL-C (220 g, d = 0.1 mg, OIML R 76 class I,
/// e = 1 mg, decision rule `rule`) and the E2 weights W20, W50, W100, W200 with zero correction, each U within a third
/// of its OIML R 111-1:2004 MPE. Returns the database path (cal.db).
std::filesystem::path calibration_lab(const ScratchDir& dir, const std::string& rule = "simple");
/// The calibration run file of that example: repeatability at W100 (five 100.0003, five 100.0004), eccentricity at
/// W100 (centre 100.0003, largest deviation +0.0002 g at front-left), and one reading up per load giving
/// E = +0.1, +0.2, +0.4, +0.6 mg and, at W200, `w200_reading` - 200 g (+0.8 mg by default).
std::string calibration_run_file(const std::string& w200_reading = "200.0008");

}  // namespace plumb::test
