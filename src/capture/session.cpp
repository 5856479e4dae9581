#include "capture/session.hpp"

#include <date/date.h>
#include <fmt/ostream.h>
#include <poll.h>
#include <unistd.h>

#include <array>
#include <cerrno>
#include <chrono>
#include <ostream>

#include "app/registry/balance_port.hpp"
#include "capture/interrupt.hpp"
#include "core/line_splitter.hpp"

namespace plumb::capture {
namespace {

/// Lines typed on the keyboard, empty ones kept (Enter alone asks the balance for a reading).
class KeyboardLines {
 public:
  void feed(std::string_view bytes) { buffer_.append(bytes); }
  std::optional<std::string> next() {
    const auto end = buffer_.find('\n');
    if (end == std::string::npos) return std::nullopt;
    std::string line = buffer_.substr(0, end);
    buffer_.erase(0, end + 1);
    if (!line.empty() && line.back() == '\r') line.pop_back();
    return line;
  }

 private:
  std::string buffer_;
};

bool is_stop(const std::string& typed) {
  const std::string word = app::trimmed_typed(typed);
  return word == "stop" || word == "q" || word == "quit";
}

/// A line typed on the keyboard while the readings come from the port and the step wants none typed.
void typed_beside_port(const Guide& guide, ByteSource& port, const std::string& typed, std::ostream& out) {
  const auto& settings = guide.port_settings();
  const bool can_ask = settings && settings->send_command;
  if (typed.find_first_not_of(" \t") == std::string::npos && can_ask) {
    if (!port.send(app::command_bytes(*settings->send_command)))
      fmt::print(out, "  the command could not be sent to {}.\n", port.name());
    return;
  }
  fmt::print(out, "  readings come from {}; type stop to stop{}.\n", port.name(),
             can_ask ? ", or press Enter to ask for a reading" : "");
  out.flush();
}

SessionResult ended(SessionEnd end, std::string why) {
  return {end, std::move(why)};
}

}  // namespace

std::string arrival_time() {
  return date::format("%FT%TZ", std::chrono::floor<std::chrono::milliseconds>(std::chrono::system_clock::now()));
}

std::string how_to_read(const ByteSource* port, const std::optional<store::BalancePort>& settings) {
  if (!port) return "type the reading:";
  if (settings && settings->send_command) return "press Enter to ask the balance for the reading.";
  return "send the reading from the balance (its print key).";
}

SessionResult run_session(Guide& guide, ByteSource* port, int keyboard_fd, std::ostream& out) {
  const InterruptGuard guard;
  guide.introduce(out);
  out.flush();
  KeyboardLines keyboard;
  LineSplitter balance_lines;
  bool keyboard_open = true;
  while (!guide.complete()) {
    if (InterruptGuard::interrupted())
      return ended(SessionEnd::interrupted,
                   fmt::format("interrupted after {}; nothing was written.", guide.progress()));
    std::array<pollfd, 2> fds{};
    nfds_t n = 0;
    if (keyboard_open) fds[n++] = {keyboard_fd, POLLIN, 0};
    const nfds_t port_index = n;
    if (port) fds[n++] = {port->fd(), POLLIN, 0};
    if (n == 0)
      return ended(SessionEnd::input_ended,
                   fmt::format("input ended after {}; nothing was written.", guide.progress()));
    // Wakes at least every 100 ms to notice Ctrl-C even when a signal arrives between the check and the wait.
    const int ready = ::poll(fds.data(), n, 100);
    if (ready < 0 && errno != EINTR)
      return ended(SessionEnd::line_closed,
                   fmt::format("waiting for input failed after {}; nothing was written.", guide.progress()));
    if (ready <= 0) continue;
    if (keyboard_open && (fds[0].revents & (POLLIN | POLLHUP | POLLERR)) != 0) {
      std::array<char, 256> buf{};
      const ssize_t got = ::read(keyboard_fd, buf.data(), buf.size());
      if (got > 0) {
        keyboard.feed(std::string_view(buf.data(), static_cast<std::size_t>(got)));
      } else if (got == 0 || (errno != EAGAIN && errno != EINTR)) {
        keyboard_open = false;
        // Typed input that ends while a typed value is still wanted ends the capture; with a port, the readings
        // may still come when no step needs the keyboard.
        if (!port || guide.wants_typed())
          return ended(SessionEnd::input_ended,
                       fmt::format("the typed input ended after {}; nothing was written.", guide.progress()));
      }
      while (auto typed = keyboard.next()) {
        if (is_stop(*typed))
          return ended(SessionEnd::stopped, fmt::format("stopped after {}; nothing was written.", guide.progress()));
        if (port && !guide.wants_typed()) {
          typed_beside_port(guide, *port, *typed, out);
          continue;
        }
        if (typed->find_first_not_of(" \t\r") == std::string::npos) continue;
        guide.typed(*typed, arrival_time(), out);
        out.flush();
        if (guide.complete()) break;
      }
    }
    if (port && !guide.complete() && (fds[port_index].revents & (POLLIN | POLLHUP | POLLERR | POLLNVAL)) != 0) {
      std::string bytes;
      const bool open = port->read_available(bytes);
      const std::string at = arrival_time();
      balance_lines.feed(bytes);
      while (auto line = balance_lines.next()) {
        guide.port_line(*line, at, out);
        out.flush();
        if (guide.complete()) break;
      }
      if (!guide.complete() && (!open || (bytes.empty() && (fds[port_index].revents & POLLHUP) != 0)))
        return ended(SessionEnd::line_closed,
                     fmt::format("the line from {} closed after {} (a cable pulled, the balance off, or the end of "
                                 "the file); nothing was written.",
                                 port->name(), guide.progress()));
      if (!keyboard_open && guide.wants_typed())
        return ended(SessionEnd::input_ended,
                     fmt::format("the typed input ended after {}; nothing was written.", guide.progress()));
    }
  }
  return {};
}

}  // namespace plumb::capture
