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

}  // namespace plumb::test
