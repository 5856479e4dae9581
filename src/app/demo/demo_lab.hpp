#pragma once
// Builds the invented demo laboratory of examples/demo-lab.json: weights, balances and about a year of
// weekly checks generated deterministically (fixed seed), through the same validated path as real input.
#include <filesystem>
#include <functional>
#include <string>
#include <vector>

#include "core/dates.hpp"

namespace plumb::app {

/// A demo account: invented, with a password printed by `plumb demo` and good for the demo only.
struct DemoUser {
  std::string login, name, role, password;
};

struct DemoSummary {
  std::filesystem::path db_path;
  int runs = 0;
  int failed_runs = 0;
  Date report_on;
  std::string lab;
  std::int64_t showcase_run = 0;  ///< a run worth printing a certificate for
  std::vector<DemoUser> users;
};

/// Creates the demo database at `path`. An existing file is replaced only if it is itself a plumb demo
/// database; anything else there is refused. `progress(done, total)` is called as runs are recorded.
DemoSummary build_demo(const std::filesystem::path& path, const std::function<void(int, int)>& progress);

}  // namespace plumb::app
