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
RunResult run_plumb(const std::vector<std::string>& args, const std::filesystem::path& cwd,
                    const std::string& input = "");

/// `sqlite3 DB .dump`: the whole content of a database as SQL text, for before/after comparison.
std::string dump_database(const std::filesystem::path& db);

/// Sets up the lab of the weekly-check example: lab, W100 and BAL-A. Returns the database path.
std::filesystem::path example_lab(const ScratchDir& dir);

/// The lab of the calibration example (tests/cli/calibration_test.cpp): BAL-C (220 g, d = 0.1 mg, OIML R 76 class I,
/// e = 1 mg, decision rule `rule`) and the E2 weights W20, W50, W100, W200 with zero correction, each U within a third
/// of its OIML R 111-1:2004 MPE. Returns the database path (cal.db).
std::filesystem::path calibration_lab(const ScratchDir& dir, const std::string& rule = "simple");
/// The calibration run file of that example: repeatability at W100 (five 100.0003, five 100.0004), eccentricity at
/// W100 (centre 100.0003, largest deviation +0.0002 g at front-left), and one reading up per load giving
/// E = +0.1, +0.2, +0.4, +0.6 mg and, at W200, `w200_reading` - 200 g (+0.8 mg by default).
std::string calibration_run_file(const std::string& w200_reading = "200.0008");

}  // namespace plumb::test
