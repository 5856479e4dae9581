#pragma once
// Where the bytes of a capture come from: a serial port opened with libserialport and set up from the balance's
// port settings, or any file, FIFO or pseudo-terminal read as it is. Both give a file descriptor to wait on, so
// one loop can watch the balance and the keyboard together.
#include <memory>
#include <string>
#include <string_view>

#include "store/balance_ports.hpp"

namespace plumb::capture {

class ByteSource {
 public:
  ByteSource() = default;
  ByteSource(const ByteSource&) = delete;
  ByteSource& operator=(const ByteSource&) = delete;
  virtual ~ByteSource() = default;
  /// The descriptor to poll for input.
  [[nodiscard]] virtual int fd() const = 0;
  /// Appends what is waiting to `out`. False when the line has closed (end of file, a cable pulled, the other
  /// end of a pseudo-terminal gone).
  virtual bool read_available(std::string& out) = 0;
  /// Sends `bytes` (the command that asks the balance for a reading). False when it could not be sent.
  virtual bool send(std::string_view bytes) = 0;
  /// For messages: the device or file name.
  [[nodiscard]] virtual const std::string& name() const = 0;
};

/// A file, FIFO or terminal device read as it is (a terminal is set to raw mode: no echo, no line editing).
/// Throws InputError naming `field` when it cannot be opened.
std::unique_ptr<ByteSource> open_path_source(const std::string& path, std::string_view field = "--from");

/// The balance's port: a serial port through libserialport with the stored baud, parity, data bits, stop bits
/// and handshake. A device that libserialport does not know as a serial port (a pseudo-terminal) is read as it
/// is, and `note` says so. Throws InputError when it cannot be opened or set up.
std::unique_ptr<ByteSource> open_port_source(const store::BalancePort& port, std::string& note);

}  // namespace plumb::capture
