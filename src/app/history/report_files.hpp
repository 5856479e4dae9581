#pragma once
// The files of a report written as it goes: each created owner-only (mode 0600) under a scratch name, filled in
// chunks and renamed into place when complete; a folder made for them is 0700. Unless keep() is called, the
// destructor removes every file and folder this writer created, so a command that fails leaves nothing behind.
#include <filesystem>
#include <fstream>
#include <string>
#include <string_view>
#include <vector>

namespace plumb::app {

class ReportFiles {
 public:
  ReportFiles() = default;
  ~ReportFiles();
  ReportFiles(const ReportFiles&) = delete;
  ReportFiles& operator=(const ReportFiles&) = delete;

  /// Makes `folder` (0700) unless it exists. StorageError when it cannot.
  void make_folder(const std::filesystem::path& folder);
  /// Starts `path`: later write() calls go to it until finish().
  void start(const std::filesystem::path& path);
  /// Appends `bytes` and empties the caller's buffer, so a page is never held whole.
  void write(std::string& bytes);
  /// Completes the current file under its own name.
  void finish();
  void keep() { kept_ = true; }

 private:
  std::filesystem::path current_, partial_;
  std::ofstream stream_;
  std::vector<std::filesystem::path> created_files_, created_folders_;
  bool kept_ = false;
};

}  // namespace plumb::app
