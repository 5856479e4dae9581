#include "support/run_plumb.hpp"

#include <SQLiteCpp/Database.h>
#include <SQLiteCpp/Statement.h>
#include <fcntl.h>
#include <signal.h>
#include <sys/ioctl.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cstdint>
#include <cstdio>
#include <optional>
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

constexpr const char* default_member = "Lab Tester";
constexpr const char* admin_name = "Test Administrator";
constexpr const char* admin_login = "test-admin";
constexpr const char* first_password = "first-password-for-plumb";

std::filesystem::path password_file(const std::filesystem::path& cwd, const char* name, const char* password) {
  const auto p = cwd / name;
  if (!std::filesystem::exists(p)) {
    std::ofstream(p) << password << "\n";
    ::chmod(p.c_str(), 0600);
  }
  return p;
}

/// The shell command that runs plumb in `cwd` exactly with `args`, without the helper's additions: test-only fast
/// password hashing and a session folder of the scratch directory's own.
std::string raw_shell_command(const std::vector<std::string>& args, const std::filesystem::path& cwd) {
  std::string cmd = "cd " + quote(cwd.string()) +
                    " && env -u PLUMB_DB -u PLUMB_LAYOUT PLUMB_TEST_ONLY_FAST_PASSWORD_HASHING=1 XDG_STATE_HOME=" +
                    quote((cwd / ".plumb-state").string()) + " " + quote(plumb_binary().string());
  for (const auto& a : args) cmd += " " + quote(a);
  return cmd;
}

/// The command as plumb would run it, without the helper's additions.
RunResult run_raw(const std::vector<std::string>& args, const std::filesystem::path& cwd, const std::string& input) {
  const auto in = cwd / ".stdin", out = cwd / ".stdout", err = cwd / ".stderr";
  std::ofstream(in, std::ios::binary) << input;
  std::string cmd = raw_shell_command(args, cwd);
  cmd += " <" + quote(in.string()) + " >" + quote(out.string()) + " 2>" + quote(err.string());
  const int raw = std::system(cmd.c_str());
  RunResult r;
  r.status = WIFEXITED(raw) ? WEXITSTATUS(raw) : -1;
  r.out = slurp(out);
  r.err = slurp(err);
  return r;
}

struct Plan {
  std::vector<std::string> args;  ///< without the --as pairs
  std::optional<std::string> member;
  std::optional<std::filesystem::path> db;
  std::string command;  ///< the first word after the global options
  bool explicit_login = false;
};

Plan plan_of(const std::vector<std::string>& args) {
  Plan p;
  for (std::size_t i = 0; i < args.size(); ++i) {
    if (args[i] == "--as" && i + 1 < args.size()) {
      p.member = args[++i];
      continue;
    }
    p.args.push_back(args[i]);
  }
  std::size_t i = 0;
  for (; i < p.args.size() && p.args[i].rfind("--", 0) == 0; ++i) {
    const auto& a = p.args[i];
    if (a == "--user" || a == "--password-file" || a == "--password-stdin") p.explicit_login = true;
    if (a == "--db" && i + 1 < p.args.size())
      p.db = p.args[++i];
    else if (a.rfind("--db=", 0) == 0)
      p.db = a.substr(5);
    else if ((a == "--user" || a == "--password-file") && i + 1 < p.args.size())
      ++i;
  }
  if (i < p.args.size()) p.command = p.args[i];
  return p;
}

bool has_user(const std::filesystem::path& db, const std::string& login) {
  try {
    SQLite::Database d(db.string(), SQLite::OPEN_READONLY);
    d.setBusyTimeout(30000);  // another process (plumb serve) may be writing: wait, as plumb itself does
    if (!d.tableExists("users")) return false;
    SQLite::Statement q(d, "SELECT count(*) FROM users WHERE login = ?");
    q.bind(1, login);
    return q.executeStep() && q.getColumn(0).getInt() > 0;
  } catch (const std::exception&) {
    return false;
  }
}

/// Creates the member `name` in `db` unless it is there; false when it cannot (a database without the test
/// administrator, e.g. one from before user accounts).
bool ensure_member(const std::filesystem::path& db, const std::string& name, const std::filesystem::path& cwd) {
  const std::string login = name == admin_name ? admin_login : test_login(name);
  if (has_user(db, login)) return true;
  const auto pw = password_file(cwd, ".plumb-test-password", test_password);
  // `plumb demo` makes its own administrator, whose demo-only password it prints.
  std::string admin = admin_login, admin_pw = pw.string();
  if (!has_user(db, admin_login)) {
    if (!has_user(db, "demo-admin")) return false;
    admin = "demo-admin";
    admin_pw = password_file(cwd, ".plumb-demo-admin-password", "demo-only-admin-pass").string();
  }
  const auto first = password_file(cwd, ".plumb-test-first-password", first_password);
  const auto add = run_raw({"--db", db.string(), "--user", admin, "--password-file", admin_pw, "user", "add", login,
                            "--name", name, "--role", "technician", "--role", "reviewer", "--role", "quality-manager",
                            "--new-password-file", first.string()},
                           cwd, "");
  if (add.status != 0) throw std::runtime_error("test member \"" + name + "\" could not be added: " + add.err);
  const auto change = run_raw({"--db", db.string(), "--user", login, "--password-file", first.string(), "user",
                               "password", "--new-password-file", pw.string()},
                              cwd, "");
  if (change.status != 0)
    throw std::runtime_error("test member \"" + name + "\" could not set its password: " + change.err);
  return true;
}

}  // namespace

std::string test_login(const std::string& full_name) {
  std::string slug;
  for (unsigned char c : full_name) {
    if ((c >= 'a' && c <= 'z') || (c >= '0' && c <= '9'))
      slug += static_cast<char>(c);
    else if (c >= 'A' && c <= 'Z')
      slug += static_cast<char>(c - 'A' + 'a');
    else if (!slug.empty() && slug.back() != '-')
      slug += '-';
  }
  while (!slug.empty() && slug.back() == '-') slug.pop_back();
  if (slug.size() > 40) slug.resize(40);
  std::uint32_t h = 2166136261u;  // FNV-1a: two names with the same letters get different ids
  for (unsigned char c : full_name) h = (h ^ c) * 16777619u;
  char hex[9];
  std::snprintf(hex, sizeof hex, "%08x", h);
  return (slug.empty() ? "member" : slug) + "-" + hex;
}

void prepare_login(const std::vector<std::string>& args, const std::filesystem::path& cwd) {
  const Plan p = plan_of(args);
  if (p.explicit_login || !p.db || p.command == "init") return;
  const auto db = p.db->is_absolute() ? *p.db : cwd / *p.db;
  if (std::filesystem::exists(db)) ensure_member(db, p.member.value_or(default_member), cwd);
}

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

std::vector<std::string> logged_in_args(const std::vector<std::string>& args, const std::filesystem::path& cwd) {
  const Plan p = plan_of(args);
  if (p.explicit_login || !p.db) return p.args;
  const auto pw = password_file(cwd, ".plumb-test-password", test_password).string();
  const auto db = p.db->is_absolute() ? *p.db : cwd / *p.db;
  if (p.command == "init") {
    std::vector<std::string> full = {"--password-file", pw};
    full.insert(full.end(), p.args.begin(), p.args.end());
    if (std::find(p.args.begin(), p.args.end(), "--admin") == p.args.end())
      full.insert(full.end(), {"--admin", admin_login, "--admin-name", admin_name});
    return full;
  }
  const std::string member = p.member.value_or(default_member);
  if (!std::filesystem::exists(db) || !ensure_member(db, member, cwd)) return p.args;
  std::vector<std::string> full = {"--user", member == admin_name ? admin_login : test_login(member), "--password-file",
                                   pw};
  full.insert(full.end(), p.args.begin(), p.args.end());
  return full;
}

std::vector<std::string> login_options(const std::filesystem::path& db, const std::string& member,
                                       const std::filesystem::path& cwd) {
  if (!ensure_member(db, member, cwd)) return {};
  return {"--user", member == admin_name ? admin_login : test_login(member), "--password-file",
          password_file(cwd, ".plumb-test-password", test_password).string()};
}

std::string plumb_shell_command(const std::vector<std::string>& args, const std::filesystem::path& cwd) {
  return raw_shell_command(logged_in_args(args, cwd), cwd);
}

RunResult run_plumb(const std::vector<std::string>& args, const std::filesystem::path& cwd, const std::string& input) {
  return run_raw(logged_in_args(args, cwd), cwd, input);
}

PlumbProcess::PlumbProcess(const std::vector<std::string>& args, const std::filesystem::path& cwd,
                           const std::string& input, int stdin_fd, int stdout_fd, bool terminal)
    : cwd_(cwd) {
  // The log-in first: making a member's account runs plumb, which would replace the .stdin written below.
  const auto full = logged_in_args(args, cwd);
  std::ofstream(cwd / ".stdin", std::ios::binary) << input;
  // Everything the child needs is built before fork: after it, only async-signal-safe calls until exec.
  const std::string binary = plumb_binary().string();
  std::vector<std::string> argv_text{binary};
  argv_text.insert(argv_text.end(), full.begin(), full.end());
  std::vector<char*> argv;
  for (auto& a : argv_text) argv.push_back(a.data());
  argv.push_back(nullptr);
  std::vector<std::string> env_text;
  for (char** e = environ; *e; ++e) {
    const std::string_view entry(*e);
    if (entry.rfind("PLUMB_DB=", 0) == 0 || entry.rfind("PLUMB_LAYOUT=", 0) == 0) continue;
    if (entry.rfind("PLUMB_TEST_ONLY_FAST_PASSWORD_HASHING=", 0) == 0 || entry.rfind("XDG_STATE_HOME=", 0) == 0)
      continue;
    env_text.emplace_back(entry);
  }
  env_text.emplace_back("PLUMB_TEST_ONLY_FAST_PASSWORD_HASHING=1");
  env_text.emplace_back("XDG_STATE_HOME=" + (cwd / ".plumb-state").string());
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

std::string sqlite_shell(const std::filesystem::path& db, const std::string& sql) {
  const auto out = db.string() + ".query.txt";
  const std::string cmd = "sqlite3 " + quote(db.string()) + " " + quote(sql) + " > " + quote(out);
  if (std::system(cmd.c_str()) != 0) throw std::runtime_error("sqlite3 failed for " + db.string() + ": " + sql);
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

std::filesystem::path pipette_balance_lab(const ScratchDir& dir) {
  const auto db = example_lab(dir);
  dir.write("sm02.csv",
            "reading\n100.00003\n100.00004\n100.00002\n100.00003\n100.00005\n100.00003\n100.00002\n100.00004\n"
            "100.00003\n100.00003\n");
  const std::vector<std::vector<std::string>> steps = {
      {"--db", db.string(), "balance", "add", "SM-02", "--capacity", "120g", "--readability", "0.01mg", "--every", "7d",
       "--smallest-net", "50mg", "--location", "Weighing room", "--since", "2026-01-05"},
      {"--db", db.string(), "check", "record", "SM-02", "--weight", "W100", "--readings", "sm02.csv", "--on",
       "2026-11-30", "--as", "A. Technician"}};
  for (const auto& s : steps) {
    const auto r = run_plumb(s, dir.path());
    if (r.status != 0) throw std::runtime_error("pipette balance lab setup failed: " + r.err);
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
