#include "support/run_plumb.hpp"

#include <fcntl.h>
#include <signal.h>
#include <sys/ioctl.h>
#include <sys/wait.h>
#include <unistd.h>

#include <tuple>

#include <fstream>
#include <random>
#include <sstream>
#include <stdexcept>

#include "support/paths.hpp"

namespace plumb::test {
namespace {

std::string quote(const std::string& s) {
  std::string q = "'";
  for (char c : s) q += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return q + "'";
}

std::string slurp(const std::filesystem::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::stringstream s;
  s << in.rdbuf();
  return s.str();
}

}  // namespace

ScratchDir::ScratchDir() {
  std::random_device rd;
  path_ = std::filesystem::temp_directory_path() / ("plumb-test-" + std::to_string(rd()) + std::to_string(rd()));
  std::filesystem::create_directories(path_);
}

ScratchDir::~ScratchDir() {
  std::error_code ec;
  std::filesystem::remove_all(path_, ec);
}

void ScratchDir::write(const std::string& name, const std::string& text) const {
  std::ofstream(path_ / name, std::ios::binary) << text;
}

std::string plumb_shell_command(const std::vector<std::string>& args) {
  std::string cmd = "env -u PLUMB_DB -u PLUMB_LAYOUT " + quote(plumb_binary().string());
  for (const auto& a : args) cmd += " " + quote(a);
  return cmd;
}

RunResult run_plumb(const std::vector<std::string>& args, const std::filesystem::path& cwd, const std::string& input) {
  const auto in = cwd / ".stdin", out = cwd / ".stdout", err = cwd / ".stderr";
  std::ofstream(in, std::ios::binary) << input;
  std::string cmd = "cd " + quote(cwd.string()) + " && " + plumb_shell_command(args);
  cmd += " <" + quote(in.string()) + " >" + quote(out.string()) + " 2>" + quote(err.string());
  const int raw = std::system(cmd.c_str());
  RunResult r;
  r.status = WIFEXITED(raw) ? WEXITSTATUS(raw) : -1;
  r.out = slurp(out);
  r.err = slurp(err);
  return r;
}

PlumbProcess::PlumbProcess(const std::vector<std::string>& args, const std::filesystem::path& cwd,
                           const std::string& input, int stdin_fd, int stdout_fd, bool terminal)
    : cwd_(cwd) {
  std::ofstream(cwd / ".stdin", std::ios::binary) << input;
  // Everything the child needs is built before fork: after it, only async-signal-safe calls until exec.
  const std::string binary = plumb_binary().string();
  std::vector<std::string> argv_text{binary};
  argv_text.insert(argv_text.end(), args.begin(), args.end());
  std::vector<char*> argv;
  for (auto& a : argv_text) argv.push_back(a.data());
  argv.push_back(nullptr);
  std::vector<std::string> env_text;
  for (char** e = environ; *e; ++e) {
    const std::string_view entry(*e);
    if (entry.rfind("PLUMB_DB=", 0) == 0 || entry.rfind("PLUMB_LAYOUT=", 0) == 0) continue;
    env_text.emplace_back(entry);
  }
  std::vector<char*> envp;
  for (auto& e : env_text) envp.push_back(e.data());
  envp.push_back(nullptr);
  const std::string in_path = (cwd / ".stdin").string(), out_path = (cwd / ".stdout").string(),
                    err_path = (cwd / ".stderr").string(), dir = cwd.string();
  pid_ = ::fork();
  if (pid_ < 0) throw std::runtime_error("fork failed");
  if (pid_ == 0) {
    if (terminal) {
      ::setsid();
      ::ioctl(stdin_fd, TIOCSCTTY, 0);
    }
    const int in = stdin_fd >= 0 ? stdin_fd : ::open(in_path.c_str(), O_RDONLY);
    const int out = stdout_fd >= 0 ? stdout_fd : ::open(out_path.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0600);
    const int err = ::open(err_path.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0600);
    ::dup2(in, 0);
    ::dup2(out, 1);
    ::dup2(err, 2);
    // The test's other descriptors stay with the test: a simulator's end of a pseudo-terminal held open by
    // plumb would keep plumb from ever seeing the line close.
    for (int fd = 3; fd < 1024; ++fd) ::close(fd);
    if (::chdir(dir.c_str()) != 0) ::_exit(127);
    ::execve(binary.c_str(), argv.data(), envp.data());
    ::_exit(127);
  }
}

PlumbProcess::~PlumbProcess() {
  if (!waited_ && pid_ > 0) {
    ::kill(pid_, SIGKILL);
    ::waitpid(pid_, nullptr, 0);
  }
}

void PlumbProcess::signal(int signal) const {
  ::kill(pid_, signal);
}

std::string PlumbProcess::output_so_far() const {
  return slurp(cwd_ / ".stdout");
}

void PlumbProcess::wait_for_output(const std::string& text, int seconds) const {
  for (int waited_ms = 0; output_so_far().find(text) == std::string::npos; waited_ms += 2) {
    if (waited_ms > seconds * 1000)
      throw std::runtime_error("plumb did not print \"" + text + "\"; it printed:\n" + output_so_far());
    ::usleep(2000);
  }
}

RunResult PlumbProcess::wait(int seconds) {
  RunResult r;
  int raw = 0;
  for (int waited_ms = 0;; waited_ms += 5) {
    const pid_t done = ::waitpid(pid_, &raw, WNOHANG);
    if (done == pid_) break;
    if (waited_ms > seconds * 1000) {
      ::kill(pid_, SIGKILL);
      ::waitpid(pid_, &raw, 0);
      waited_ = true;
      throw std::runtime_error("plumb did not end within the time allowed");
    }
    ::usleep(5000);
  }
  waited_ = true;
  r.status = WIFEXITED(raw) ? WEXITSTATUS(raw) : -1;
  r.out = slurp(cwd_ / ".stdout");
  r.err = slurp(cwd_ / ".stderr");
  return r;
}

std::string dump_database(const std::filesystem::path& db) {
  const auto out = db.string() + ".dump.txt";
  const std::string cmd = "sqlite3 " + quote(db.string()) + " .dump > " + quote(out);
  if (std::system(cmd.c_str()) != 0) throw std::runtime_error("sqlite3 .dump failed for " + db.string());
  std::string text = slurp(out);
  std::filesystem::remove(out);
  return text;
}

std::filesystem::path example_lab(const ScratchDir& dir) {
  const auto db = dir.file("lab.db");
  const std::vector<std::vector<std::string>> steps = {
      {"--db", db.string(), "init", "--lab", "Example Analytical Lab"},
      {"--db",    db.string(),    "weight",     "add",           "W100",      "--nominal", "100g", "--class",
       "E2",      "--correction", "0.03mg",     "--uncertainty", "0.05mg",    "--k",       "2",    "--certificate",
       "RC-2291", "--calibrated", "2026-03-02", "--due",         "2027-03-02"},
      {"--db", db.string(), "balance", "add", "BAL-A", "--capacity", "220g", "--readability", "0.1mg", "--every", "7d",
       "--smallest-net", "200mg", "--location", "Room 2", "--since", "2026-01-05"}};
  for (const auto& s : steps) {
    const auto r = run_plumb(s, dir.path());
    if (r.status != 0) throw std::runtime_error("example lab setup failed: " + r.err);
  }
  return db;
}

std::filesystem::path calibration_lab(const ScratchDir& dir, const std::string& rule) {
  const auto db = dir.file("cal.db").string();
  std::vector<std::vector<std::string>> steps = {
      {"--db", db, "init", "--lab", "Example Calibration Lab"},
      {"--db", db, "balance", "add", "BAL-C", "--capacity", "220g", "--readability", "0.1mg", "--every", "7d",
       "--smallest-net", "200mg", "--since", "2026-01-05"},
      {"--db", db, "balance", "set-calibration", "BAL-C", "--class", "I", "--e", "1mg", "--tolerance", "r76",
       "--decision-rule", rule, "--calibrate-every", "1y", "--since", "2026-01-05"}};
  // E2 MPE, OIML R 111-1:2004 Table 1: 20 g 0.08 mg, 50 g 0.10 mg, 100 g 0.16 mg, 200 g 0.3 mg.
  for (const auto& [id, nominal, u] : std::vector<std::tuple<std::string, std::string, std::string>>{
           {"W20", "20g", "0.025mg"}, {"W50", "50g", "0.03mg"}, {"W100", "100g", "0.05mg"}, {"W200", "200g", "0.10mg"}})
    steps.push_back({"--db",
                     db,
                     "weight",
                     "add",
                     id,
                     "--nominal",
                     nominal,
                     "--class",
                     "E2",
                     "--correction",
                     "0mg",
                     "--uncertainty",
                     u,
                     "--k",
                     "2",
                     "--certificate",
                     "RC-" + id,
                     "--calibrated",
                     "2026-03-02",
                     "--due",
                     "2027-03-02"});
  for (const auto& s : steps) {
    const auto r = run_plumb(s, dir.path());
    if (r.status != 0) throw std::runtime_error("calibration lab setup failed: " + r.err);
  }
  return db;
}

std::string calibration_run_file(const std::string& w200_reading) {
  std::string csv = "stage,part,load,position,direction,reading,unit\n";
  for (int i = 0; i < 10; ++i)
    csv += std::string("as-found,repeatability,W100,,,") + (i % 2 ? "100.0004" : "100.0003") + ",g\n";
  return csv +
         "as-found,eccentricity,W100,centre,,100.0003,g\n"
         "as-found,eccentricity,W100,front-left,,100.0005,g\n"
         "as-found,eccentricity,W100,front-right,,100.0002,g\n"
         "as-found,eccentricity,W100,back-left,,100.0003,g\n"
         "as-found,eccentricity,W100,back-right,,100.0004,g\n"
         "as-found,indication,W20,,up,20.0001,g\n"
         "as-found,indication,W50,,up,50.0002,g\n"
         "as-found,indication,W100,,up,100.0004,g\n"
         "as-found,indication,W100+W50,,up,150.0006,g\n"
         "as-found,indication,W200,,up," +
         w200_reading + ",g\n";
}

}  // namespace plumb::test
