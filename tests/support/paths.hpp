#pragma once
// Where the tests find the outside reference data and the plumb binary.
#include <filesystem>
#include <optional>

namespace plumb::test {

/// $PLUMB_REFERENCE_DATA, else ../shared/reference-data beside the project root; nullopt when
/// neither exists (a user's fresh clone): tests that need it then skip, saying why.
std::optional<std::filesystem::path> reference_data();
std::filesystem::path source_dir();
std::filesystem::path plumb_binary();

}  // namespace plumb::test
