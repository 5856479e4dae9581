#pragma once
// The SHA-256 of a whole file, read in blocks (an import file may be hundreds of megabytes).
#include <filesystem>
#include <string>

namespace plumb::store {

/// Lowercase hex SHA-256 of the file's bytes; InputError naming `field` when it cannot be read.
std::string sha256_of_file(const std::filesystem::path& file, std::string_view field);

}  // namespace plumb::store
