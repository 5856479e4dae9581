#pragma once
// Files plumb creates for a lab's records (backups, safety copies) are readable by their owner only (or the lab's
// group: store/file_access.hpp), and a new one never replaces another that appeared meanwhile: each is created
// exclusively (O_EXCL) with mode 0600 (0660 with a lab group).
#include <filesystem>

namespace plumb::store {

/// Creates `path` empty with mode 0600; false when it exists already. StorageError for any other failure.
bool create_private_file(const std::filesystem::path& path);

/// Creates the first free one of `base`, `base-2`, `base-3`, ... empty with mode 0600 and returns its name: two
/// commands in the same second that choose the same base each get a file of their own.
std::filesystem::path create_unique_private_file(const std::filesystem::path& base);

}  // namespace plumb::store
