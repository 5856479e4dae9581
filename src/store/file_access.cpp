#include "store/file_access.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <grp.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstdlib>
#include <cstring>
#include <string>
#include <vector>

#include "core/errors.hpp"

namespace plumb::store {
namespace {

std::optional<gid_t> group_named(const std::string& name) {
  std::vector<char> buffer(16384);
  group entry{};
  group* found = nullptr;
  const int error = ::getgrnam_r(name.c_str(), &entry, buffer.data(), buffer.size(), &found);
  if (error != 0 || !found) return std::nullopt;
  return found->gr_gid;
}

std::optional<gid_t> read_lab_group() {
  const char* name = std::getenv("PLUMB_GROUP");
  if (!name || !*name) return std::nullopt;
  const auto gid = group_named(name);
  if (!gid)
    throw InputError(
        fmt::format("PLUMB_GROUP \"{}\" is not a group of this system (see /etc/group); unset it to "
                    "keep the lab's files readable by their owner only.",
                    name));
  return gid;
}

}  // namespace

std::optional<gid_t> lab_group() {
  static const std::optional<gid_t> group = read_lab_group();
  return group;
}

void apply_lab_file_access() {
  ::umask(lab_group() ? 007 : 077);
}

mode_t record_file_mode() {
  return lab_group() ? 0660 : 0600;
}

mode_t record_folder_mode() {
  return lab_group() ? 02770 : 0700;
}

void give_to_lab_group(int fd, const char* path) {
  const auto group = lab_group();
  if (!group) return;
  const int result =
      fd >= 0 ? ::fchown(fd, static_cast<uid_t>(-1), *group) : ::chown(path, static_cast<uid_t>(-1), *group);
  if (result != 0)
    throw StorageError(fmt::format("cannot give \"{}\" to the group of PLUMB_GROUP: {}.", path, std::strerror(errno)));
  // mkdir() applies the umask and may drop the set-group-ID bit: set the folder's mode as intended.
  if (fd < 0 && ::chmod(path, record_folder_mode()) != 0)
    throw StorageError(fmt::format("cannot set the mode of \"{}\": {}.", path, std::strerror(errno)));
}

}  // namespace plumb::store
