#include "app/history/report_files.hpp"

#include <fmt/format.h>
#include <sys/stat.h>
#include <unistd.h>

#include <system_error>

#include "core/errors.hpp"
#include "store/private_file.hpp"

namespace plumb::app {

ReportFiles::~ReportFiles() {
  if (kept_) return;
  std::error_code ec;  // best effort: the command's own error is the one to report
  stream_.close();
  if (!partial_.empty()) std::filesystem::remove(partial_, ec);
  for (const auto& f : created_files_) std::filesystem::remove(f, ec);
  for (auto it = created_folders_.rbegin(); it != created_folders_.rend(); ++it) std::filesystem::remove(*it, ec);
}

void ReportFiles::make_folder(const std::filesystem::path& folder) {
  std::error_code ec;
  if (std::filesystem::is_directory(folder, ec)) return;
  if (::mkdir(folder.c_str(), 0700) != 0)
    throw StorageError(fmt::format("cannot create the report folder \"{}\".", folder.string()));
  created_folders_.push_back(folder);
}

void ReportFiles::start(const std::filesystem::path& path) {
  current_ = path;
  // The process id keeps two plumb processes writing the same report from sharing a scratch file.
  partial_ = fmt::format("{}.partial-{}", path.string(), getpid());
  std::error_code ec;
  std::filesystem::remove(partial_, ec);  // a scratch file of an earlier crashed run of this very process id
  if (!store::create_private_file(partial_))
    throw StorageError(fmt::format("cannot write the report file \"{}\".", path.string()));
  stream_.open(partial_, std::ios::binary | std::ios::trunc);
  if (!stream_) throw StorageError(fmt::format("cannot write the report file \"{}\".", path.string()));
}

void ReportFiles::write(std::string& bytes) {
  if (!stream_.write(bytes.data(), static_cast<std::streamsize>(bytes.size())))
    throw StorageError(fmt::format("cannot write the report file \"{}\".", current_.string()));
  bytes.clear();
}

void ReportFiles::finish() {
  stream_.close();
  if (!stream_) throw StorageError(fmt::format("cannot write the report file \"{}\".", current_.string()));
  std::error_code ec;
  const bool existed = std::filesystem::exists(current_, ec);
  std::filesystem::rename(partial_, current_, ec);
  if (ec) throw StorageError(fmt::format("cannot write the report file \"{}\".", current_.string()));
  partial_.clear();
  // A page that replaced one of an earlier report is not ours to remove; a new one is.
  if (!existed) created_files_.push_back(current_);
  stream_.clear();
}

}  // namespace plumb::app
