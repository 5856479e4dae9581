#include "store/file_output.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <fstream>
#include <system_error>

#include "core/errors.hpp"

namespace plumb::store {

void write_whole_file(const std::filesystem::path& path, std::string_view bytes, std::string_view what) {
  // The process id keeps two plumb processes writing the same name from sharing a scratch file.
  const std::filesystem::path partial = fmt::format("{}.partial-{}", path.string(), getpid());
  std::error_code ec;
  {
    std::ofstream f(partial, std::ios::binary | std::ios::trunc);
    if (f && f.write(bytes.data(), static_cast<std::streamsize>(bytes.size())) && f.flush()) {
      f.close();
      if (f) std::filesystem::rename(partial, path, ec);
      if (f && !ec) return;
    }
  }
  std::filesystem::remove(partial, ec);
  throw StorageError(fmt::format("cannot write the {} \"{}\".", what, path.string()));
}

}  // namespace plumb::store
