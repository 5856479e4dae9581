#pragma once
// The invented logo of the demo laboratory, drawn with cairo (no real lab, brand or logo).
#include <filesystem>

namespace plumb::report {

/// Writes a 240 x 240 pixel PNG; StorageError when it cannot be written.
void write_demo_logo(const std::filesystem::path& path);

}  // namespace plumb::report
