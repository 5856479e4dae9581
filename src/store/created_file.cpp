#include "store/created_file.hpp"

#include <system_error>

namespace plumb::store {

CreatedFileGuard::CreatedFileGuard(std::filesystem::path path) : path_(std::move(path)) {
  std::error_code ec;
  existed_ = std::filesystem::exists(path_, ec) || ec;  // when it cannot be told, treat it as existing
  for (auto folder = path_.parent_path(); !folder.empty(); folder = folder.parent_path()) {
    if (std::filesystem::exists(folder, ec) || ec) break;
    new_folders_.push_back(folder);
    if (folder == folder.parent_path()) break;
  }
}

CreatedFileGuard::~CreatedFileGuard() {
  if (kept_ || existed_) return;
  std::error_code ec;  // best effort: a destructor reports nothing, and the command's own error is the one to show
  for (const char* suffix : {"", "-wal", "-shm", "-journal"}) std::filesystem::remove(path_.string() + suffix, ec);
  for (const auto& folder : new_folders_) std::filesystem::remove(folder, ec);  // only when empty
}

}  // namespace plumb::store
