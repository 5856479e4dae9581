#include "support/paths.hpp"

#include <cstdlib>

namespace plumb::test {

std::optional<std::filesystem::path> reference_data() {
  if (const char* env = std::getenv("PLUMB_REFERENCE_DATA"); env && *env) {
    if (std::filesystem::is_directory(env)) return std::filesystem::path(env);
  }
  const auto beside = source_dir().parent_path() / "shared" / "reference-data";
  if (std::filesystem::is_directory(beside)) return beside;
  return std::nullopt;
}

std::filesystem::path source_dir() { return PLUMB_SOURCE_DIR; }
std::filesystem::path plumb_binary() { return PLUMB_BINARY; }

}  // namespace plumb::test
