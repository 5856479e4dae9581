#pragma once
// Files compiled into the binary by cmake/embed.cmake.
#include <string_view>
#include <vector>

namespace plumb::embedded {

struct Migration {
  std::string_view name;  ///< file name in schema/, e.g. "001_core.sql"
  std::string_view sql;
};

const std::vector<Migration>& migrations();
std::string_view default_layout();
std::string_view demo_scenario();

}  // namespace plumb::embedded
