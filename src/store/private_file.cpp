#include "store/private_file.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>

#include "core/errors.hpp"
#include "store/file_access.hpp"

namespace plumb::store {

bool create_private_file(const std::filesystem::path& path) {
  const int fd = ::open(path.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, record_file_mode());
  if (fd < 0) {
    if (errno == EEXIST) return false;
    throw StorageError(fmt::format("cannot create \"{}\": {}.", path.string(), std::strerror(errno)));
  }
  // The umask can only take permissions away: the file has at most the mode asked for, whatever the umask.
  try {
    give_to_lab_group(fd, path.c_str());
  } catch (...) {
    ::close(fd);
    ::unlink(path.c_str());
    throw;
  }
  ::close(fd);
  return true;
}

std::filesystem::path create_unique_private_file(const std::filesystem::path& base) {
  if (create_private_file(base)) return base;
  for (int n = 2; n < 10000; ++n) {
    std::filesystem::path candidate = base.string() + "-" + std::to_string(n);
    if (create_private_file(candidate)) return candidate;
  }
  throw StorageError(fmt::format("cannot find a free name beside \"{}\".", base.string()));
}

}  // namespace plumb::store
