#pragma once
// A command that fails leaves no file behind (DEVELOPERS.md, "Bad input"): a file it set out to create, and any
// folder made for it, is removed again unless the command reached its end. A file or folder that existed
// before is never touched.
#include <filesystem>
#include <vector>

namespace plumb::store {

class CreatedFileGuard {
 public:
  /// Notes which of `path` and its folders do not exist yet.
  explicit CreatedFileGuard(std::filesystem::path path);
  /// Removes what was created since, unless keep() was called: the file, SQLite's -wal, -shm and -journal
  /// beside it, then each new folder if it is empty.
  ~CreatedFileGuard();
  CreatedFileGuard(const CreatedFileGuard&) = delete;
  CreatedFileGuard& operator=(const CreatedFileGuard&) = delete;

  /// The command succeeded: leave the file.
  void keep() { kept_ = true; }

 private:
  std::filesystem::path path_;
  bool existed_ = false;
  std::vector<std::filesystem::path> new_folders_;  ///< innermost first
  bool kept_ = false;
};

}  // namespace plumb::store
