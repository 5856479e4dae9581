#pragma once
// Writing a whole output file (a certificate PDF, an HTML report, a chart): into a scratch file beside it first,
// then renamed over the name asked for, so that a write that fails half-way (a full disk, a folder that vanished)
// leaves neither a truncated file nor the scratch file behind.
#include <filesystem>
#include <string_view>

namespace plumb::store {

/// Writes `bytes` to `path` as one step. StorageError naming `what` and the path when it cannot.
void write_whole_file(const std::filesystem::path& path, std::string_view bytes, std::string_view what);

}  // namespace plumb::store
