#include "capture/weekly_session.hpp"

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
  const auto first = typed.find_first_not_of(" \t");
  const auto last = typed.find_last_not_of(" \t");
  if (first == std::string::npos) return false;
  const std::string word = typed.substr(first, last - first + 1);
  return word == "stop" || word == "q" || word == "quit";
}

class Conversation {
 public:
  Conversation(app::WeeklyCapture& capture, ByteSource* port, std::ostream& out)
      : capture_(capture), port_(port), out_(out) {}

  void introduce() const {
    const auto& b = capture_.balance();
    const auto& w = capture_.weight();
    fmt::print(out_, "Weekly check of {} (capacity {}, d = {}) with {} (conventional mass {}): {} readings.\n", b.id,
               b.capacity.to_string(), b.readability.to_string(), w.id, w.conventional_mass().to_string(),
               capture_.wanted());
    if (port_)
      fmt::print(out_, "Readings come from {} in {}; only stable readings are counted.\n", port_->name(),
                 to_string(capture_.expected_unit()));
    else
      fmt::print(out_, "Type each reading exactly as the balance displays it (a bare number is in {}).\n",
                 to_string(capture_.expected_unit()));
    fmt::print(out_, "Type stop (or press Ctrl-C) to stop: nothing is written until the last reading is in.\n");
    fmt::print(out_, "Step: with the pan empty, zero (tare) the balance.\n");
    ask();
  }

  void ask() const {
    const int k = capture_.counted() + 1;
    std::string how;
    if (!port_)
      how = "type the reading:";
    else if (capture_.port() && capture_.port()->send_command)
      how = "press Enter to ask the balance for the reading.";
    else
      how = "send the reading from the balance (its print key).";
    fmt::print(out_, "Reading {} of {}: place {} on the centre of the pan; when the display is stable, {}\n", k,
               capture_.wanted(), capture_.weight().id, how);
    out_.flush();
  }

  void said(const app::CaptureStep& step) const {
    if (step.outcome != app::CaptureStep::Outcome::counted) {
      fmt::print(out_, "  {}\n", step.message);
      out_.flush();
      return;
    }
    const auto s = capture_.summary();
    const auto& last = capture_.last_counted();
    fmt::print(out_, "  reading {} counted: {} {}   n = {}, mean = {}{}\n", s.n, last.text, to_string(last.unit), s.n,
               s.mean, s.sd.empty() ? "" : ", s = " + s.sd);
    if (step.far_warning)
      fmt::print(out_, "  warning: reading {} is far from the others: {}.\n", s.n, *step.far_warning);
    if (!capture_.complete()) {
      fmt::print(out_, "Step: remove {} from the pan and check that the balance returns to zero.\n",
                 capture_.weight().id);
      ask();
    } else {
      fmt::print(out_, "Step: remove {} from the pan. All {} readings are in.\n", capture_.weight().id,
                 capture_.wanted());
    }
    out_.flush();
  }

  /// A line typed on the keyboard while the readings come from the port.
  void typed_beside_port(const std::string& typed) const {
    if (typed.find_first_not_of(" \t") == std::string::npos && capture_.port() && capture_.port()->send_command) {
      if (!port_->send(app::command_bytes(*capture_.port()->send_command)))
        fmt::print(out_, "  the command could not be sent to {}.\n", port_->name());
      return;
    }
    fmt::print(out_, "  readings come from {}; type stop to stop{}.\n", port_->name(),
               capture_.port() && capture_.port()->send_command ? ", or press Enter to ask for a reading" : "");
    out_.flush();
  }

 private:
  app::WeeklyCapture& capture_;
  ByteSource* port_;
  std::ostream& out_;
};

SessionResult ended(SessionEnd end, std::string why) {
  return {end, std::move(why)};
}

}  // namespace

std::string arrival_time() {
  return date::format("%FT%TZ", std::chrono::floor<std::chrono::milliseconds>(std::chrono::system_clock::now()));
}

SessionResult run_weekly_session(app::WeeklyCapture& capture, ByteSource* port, int keyboard_fd, std::ostream& out) {
  const InterruptGuard guard;
  Conversation talk(capture, port, out);
  talk.introduce();
  KeyboardLines keyboard;
  LineSplitter balance_lines;
  bool keyboard_open = true;
  const auto short_by = [&] { return fmt::format("{} of {} readings", capture.counted(), capture.wanted()); };
  while (!capture.complete()) {
    if (InterruptGuard::interrupted())
      return ended(SessionEnd::interrupted, fmt::format("interrupted after {}; nothing was written.", short_by()));
    std::array<pollfd, 2> fds{};
    nfds_t n = 0;
    if (keyboard_open) fds[n++] = {keyboard_fd, POLLIN, 0};
    const nfds_t port_index = n;
    if (port) fds[n++] = {port->fd(), POLLIN, 0};
    if (n == 0)
      return ended(SessionEnd::input_ended, fmt::format("input ended after {}; nothing was written.", short_by()));
    // Wakes at least every 100 ms to notice Ctrl-C even when a signal arrives between the check and the wait.
    const int ready = ::poll(fds.data(), n, 100);
    if (ready < 0 && errno != EINTR)
      return ended(SessionEnd::line_closed,
                   fmt::format("waiting for input failed after {}; nothing was written.", short_by()));
    if (ready <= 0) continue;
    if (keyboard_open && (fds[0].revents & (POLLIN | POLLHUP | POLLERR)) != 0) {
      std::array<char, 256> buf{};
      const ssize_t got = ::read(keyboard_fd, buf.data(), buf.size());
      if (got > 0) {
        keyboard.feed(std::string_view(buf.data(), static_cast<std::size_t>(got)));
      } else if (got == 0 || (errno != EAGAIN && errno != EINTR)) {
        keyboard_open = false;
        if (!port)
          return ended(SessionEnd::input_ended,
                       fmt::format("the typed input ended after {}; nothing was written.", short_by()));
      }
      while (auto typed = keyboard.next()) {
        if (is_stop(*typed))
          return ended(SessionEnd::stopped, fmt::format("stopped after {}; nothing was written.", short_by()));
        if (port) {
          talk.typed_beside_port(*typed);
          continue;
        }
        if (typed->find_first_not_of(" \t\r") == std::string::npos) continue;
        talk.said(capture.take_typed(*typed, arrival_time()));
        if (capture.complete()) break;
      }
    }
    if (port && !capture.complete() && (fds[port_index].revents & (POLLIN | POLLHUP | POLLERR | POLLNVAL)) != 0) {
      std::string bytes;
      const bool open = port->read_available(bytes);
      const std::string at = arrival_time();
      balance_lines.feed(bytes);
      while (auto line = balance_lines.next()) {
        talk.said(capture.take_port_line(*line, at));
        if (capture.complete()) break;
      }
      if (!capture.complete() && (!open || (bytes.empty() && (fds[port_index].revents & POLLHUP) != 0)))
        return ended(SessionEnd::line_closed,
                     fmt::format("the line from {} closed after {} (a cable pulled, the balance off, or the end of "
                                 "the file); nothing was written.",
                                 port->name(), short_by()));
    }
  }
  return {};
}

}  // namespace plumb::capture
