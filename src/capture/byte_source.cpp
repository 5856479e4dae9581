#include "capture/byte_source.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <libserialport.h>
#include <sys/stat.h>
#include <termios.h>
#include <unistd.h>

#include <array>
#include <cerrno>
#include <cstring>

#include "core/errors.hpp"

namespace plumb::capture {
namespace {

class PathSource final : public ByteSource {
 public:
  PathSource(std::string name, int fd) : name_(std::move(name)), fd_(fd) {}
  PathSource(const PathSource&) = delete;
  PathSource& operator=(const PathSource&) = delete;
  ~PathSource() override { ::close(fd_); }
  [[nodiscard]] int fd() const override { return fd_; }
  bool read_available(std::string& out) override {
    std::array<char, 512> buf{};
    const ssize_t n = ::read(fd_, buf.data(), buf.size());
    if (n > 0) {
      out.append(buf.data(), static_cast<std::size_t>(n));
      return true;
    }
    // Nothing yet on a non-blocking descriptor is not a closed line; 0 (end of file) and EIO (a
    // pseudo-terminal whose other end closed) are.
    return n < 0 && (errno == EAGAIN || errno == EINTR);
  }
  bool send(std::string_view bytes) override {
    return ::write(fd_, bytes.data(), bytes.size()) == static_cast<ssize_t>(bytes.size());
  }
  [[nodiscard]] const std::string& name() const override { return name_; }

 private:
  std::string name_;
  int fd_;
};

class SerialSource final : public ByteSource {
 public:
  SerialSource(std::string name, sp_port* port) : name_(std::move(name)), port_(port) {
    sp_get_port_handle(port_, &fd_);
  }
  SerialSource(const SerialSource&) = delete;
  SerialSource& operator=(const SerialSource&) = delete;
  ~SerialSource() override {
    sp_close(port_);
    sp_free_port(port_);
  }
  [[nodiscard]] int fd() const override { return fd_; }
  bool read_available(std::string& out) override {
    std::array<char, 512> buf{};
    const int n = sp_nonblocking_read(port_, buf.data(), buf.size());
    if (n < 0) return false;  // the device went away (a USB adapter pulled out)
    out.append(buf.data(), static_cast<std::size_t>(n));
    return true;
  }
  bool send(std::string_view bytes) override {
    return sp_blocking_write(port_, bytes.data(), bytes.size(), 1000) == static_cast<int>(bytes.size());
  }
  [[nodiscard]] const std::string& name() const override { return name_; }

 private:
  std::string name_;
  sp_port* port_;
  int fd_ = -1;
};

void set_raw_if_terminal(int fd) {
  termios t{};
  if (::tcgetattr(fd, &t) != 0) return;  // a file or a FIFO: nothing to set
  ::cfmakeraw(&t);
  ::tcsetattr(fd, TCSANOW, &t);
}

sp_parity parity_of(const std::string& p) {
  if (p == "even") return SP_PARITY_EVEN;
  if (p == "odd") return SP_PARITY_ODD;
  if (p == "mark") return SP_PARITY_MARK;
  if (p == "space") return SP_PARITY_SPACE;
  return SP_PARITY_NONE;
}

sp_flowcontrol flow_of(const std::string& h) {
  if (h == "rts-cts") return SP_FLOWCONTROL_RTSCTS;
  if (h == "dtr-dsr") return SP_FLOWCONTROL_DTRDSR;
  if (h == "xon-xoff") return SP_FLOWCONTROL_XONXOFF;
  return SP_FLOWCONTROL_NONE;
}

}  // namespace

std::unique_ptr<ByteSource> open_path_source(const std::string& path, std::string_view field) {
  struct stat st {};
  const bool known = ::stat(path.c_str(), &st) == 0;
  // A file or FIFO is only read; a FIFO's open waits for its writer, so its end of file is the writer gone. A
  // terminal device is also written to (the command that asks for a reading).
  const bool read_only = known && (S_ISREG(st.st_mode) || S_ISFIFO(st.st_mode));
  const int fd = ::open(path.c_str(), (read_only ? O_RDONLY : O_RDWR) | O_NOCTTY | O_CLOEXEC |
                                          (known && S_ISFIFO(st.st_mode) ? 0 : O_NONBLOCK));
  if (fd < 0) throw InputError(fmt::format("{} \"{}\" cannot be opened: {}.", field, path, std::strerror(errno)));
  ::fcntl(fd, F_SETFL, ::fcntl(fd, F_GETFL) | O_NONBLOCK);
  set_raw_if_terminal(fd);
  return std::make_unique<PathSource>(path, fd);
}

std::unique_ptr<ByteSource> open_port_source(const store::BalancePort& port, std::string& note) {
  sp_port* p = nullptr;
  if (sp_get_port_by_name(port.device.c_str(), &p) != SP_OK) {
    note = fmt::format(
        "{} is not a serial port libserialport knows; it is read as it is (the baud, parity, data "
        "bits, stop bits and handshake settings do not apply).",
        port.device);
    auto source = open_path_source(port.device, "balance port");
    note = fmt::format(
        "{} is not a serial port libserialport knows; it is read as it is (the baud, parity, data "
        "bits, stop bits and handshake settings do not apply).",
        port.device);
    return source;
  }
  const auto fail = [&](const char* what) {
    const std::string why = sp_last_error_message();
    sp_close(p);
    sp_free_port(p);
    throw InputError(fmt::format("balance port {}: {} failed: {}.", port.device, what, why));
  };
  if (sp_open(p, SP_MODE_READ_WRITE) != SP_OK) {
    const std::string why = sp_last_error_message();
    sp_free_port(p);
    throw InputError(fmt::format("balance port {} cannot be opened: {}.", port.device, why));
  }
  if (sp_set_baudrate(p, port.baud) != SP_OK) fail("setting the baud rate");
  if (sp_set_bits(p, port.data_bits) != SP_OK) fail("setting the data bits");
  if (sp_set_parity(p, parity_of(port.parity)) != SP_OK) fail("setting the parity");
  if (sp_set_stopbits(p, port.stop_bits) != SP_OK) fail("setting the stop bits");
  if (sp_set_flowcontrol(p, flow_of(port.handshake)) != SP_OK) fail("setting the handshake");
  return std::make_unique<SerialSource>(port.device, p);
}

}  // namespace plumb::capture
