#include "cli/credentials.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <sys/stat.h>
#include <termios.h>
#include <unistd.h>

#include <cerrno>
#include <cstdlib>
#include <cstring>
#include <iostream>

#include "core/errors.hpp"
#include "store/recorder.hpp"

namespace plumb::cli {
namespace {

std::string first_line(std::string text) {
  if (const auto end = text.find('\n'); end != std::string::npos) text.erase(end);
  if (!text.empty() && text.back() == '\r') text.pop_back();
  return text;
}

std::string read_fd(int fd) {
  std::string text;
  char buf[512];
  for (ssize_t n; (n = ::read(fd, buf, sizeof buf)) > 0;) text.append(buf, static_cast<std::size_t>(n));
  return text;
}

std::string from_password_file(const std::filesystem::path& path) {
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC | O_NOFOLLOW);
  if (fd < 0)
    throw InputError(fmt::format("--password-file \"{}\" cannot be read: {}.", path.string(), std::strerror(errno)));
  struct stat st {};
  if (::fstat(fd, &st) != 0 || !S_ISREG(st.st_mode)) {
    ::close(fd);
    throw InputError(fmt::format("--password-file \"{}\" is not a regular file.", path.string()));
  }
  if (st.st_uid != ::geteuid() || (st.st_mode & 077) != 0) {
    ::close(fd);
    throw InputError(
        fmt::format("--password-file \"{}\" has mode {:04o} or another owner; it must be readable by its "
                    "owner only (chmod 600 \"{}\").",
                    path.string(), st.st_mode & 07777, path.string()));
  }
  std::string text = read_fd(fd);
  ::close(fd);
  return first_line(text);
}

std::optional<std::string> from_terminal(const std::string& prompt) {
  const int fd = ::open("/dev/tty", O_RDWR | O_CLOEXEC);
  if (fd < 0) return std::nullopt;
  termios old{};
  if (::tcgetattr(fd, &old) != 0) {
    ::close(fd);
    return std::nullopt;
  }
  termios quiet = old;
  quiet.c_lflag &= ~static_cast<tcflag_t>(ECHO);
  (void)!::write(fd, prompt.data(), prompt.size());
  ::tcsetattr(fd, TCSAFLUSH, &quiet);
  std::string line;
  char c = 0;
  while (::read(fd, &c, 1) == 1 && c != '\n') line += c;
  ::tcsetattr(fd, TCSAFLUSH, &old);
  (void)!::write(fd, "\n", 1);
  ::close(fd);
  return first_line(line);
}

std::filesystem::path state_folder() {
  if (const char* xdg = std::getenv("XDG_STATE_HOME"); xdg && *xdg) return std::filesystem::path(xdg) / "plumb";
  const char* home = std::getenv("HOME");
  return std::filesystem::path(home ? home : ".") / ".local" / "state" / "plumb";
}

void make_private_folders(const std::filesystem::path& folder) {
  std::vector<std::filesystem::path> missing;
  for (auto p = folder; !p.empty() && !std::filesystem::exists(p); p = p.parent_path()) missing.push_back(p);
  for (auto it = missing.rbegin(); it != missing.rend(); ++it)
    if (::mkdir(it->c_str(), 0700) != 0 && errno != EEXIST)
      throw StorageError(fmt::format("cannot create the folder \"{}\": {}.", it->string(), std::strerror(errno)));
}

}  // namespace

std::optional<std::string> read_password(const PasswordSource& source, const std::string& prompt) {
  if (source.file) return from_password_file(*source.file);
  if (source.standard_input) {
    std::string line;
    std::getline(std::cin, line);
    return first_line(line);
  }
  if (!::isatty(STDIN_FILENO)) return std::nullopt;
  return from_terminal(prompt);
}

std::filesystem::path session_file(const std::filesystem::path& db) {
  const auto absolute = std::filesystem::weakly_canonical(std::filesystem::absolute(db));
  return state_folder() / "sessions" / (store::sha256_hex(absolute.string()).substr(0, 32) + ".token");
}

std::optional<std::string> read_session_token(const std::filesystem::path& db) {
  const auto path = session_file(db);
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC | O_NOFOLLOW);
  if (fd < 0) return std::nullopt;
  struct stat st {};
  const bool private_file = ::fstat(fd, &st) == 0 && st.st_uid == ::geteuid() && (st.st_mode & 077) == 0;
  std::string token = private_file ? first_line(read_fd(fd)) : std::string();
  ::close(fd);
  if (!private_file) return std::nullopt;  // a token others could read is not one to trust
  return token.empty() ? std::nullopt : std::optional(token);
}

void write_session_token(const std::filesystem::path& db, const std::string& token) {
  const auto path = session_file(db);
  make_private_folders(path.parent_path());
  std::filesystem::remove(path);
  const int fd = ::open(path.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC | O_NOFOLLOW, 0600);
  if (fd < 0) throw StorageError(fmt::format("cannot create \"{}\": {}.", path.string(), std::strerror(errno)));
  const std::string line = token + "\n";
  const bool ok = ::write(fd, line.data(), line.size()) == static_cast<ssize_t>(line.size());
  ::close(fd);
  if (!ok) throw StorageError(fmt::format("cannot write \"{}\".", path.string()));
}

void remove_session_token(const std::filesystem::path& db) {
  std::error_code ec;
  std::filesystem::remove(session_file(db), ec);
}

}  // namespace plumb::cli
