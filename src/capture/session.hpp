#pragma once
// The loop every guided capture at the bench runs: waits on the balance's data output and the keyboard together,
// hands each line to the capture's guide, and ends when the guide has all it asks for, or when the operator types
// stop, presses Ctrl-C, or the line or the typed input closes. Writes nothing: the caller records a complete
// capture. The guides (weekly check, pipette, calibration) say what to do next and what became of each line.
#include <iosfwd>
#include <optional>
#include <string>

#include "app/bench/balance_lines.hpp"
#include "capture/byte_source.hpp"

namespace plumb::capture {

enum class SessionEnd { complete, stopped, interrupted, line_closed, input_ended };

struct SessionResult {
  SessionEnd end = SessionEnd::complete;
  /// Why it ended short, one sentence ending in "nothing was written." (after "plumb: ").
  std::string why;
};

/// One procedure's side of the conversation.
class Guide {
 public:
  Guide() = default;
  Guide(const Guide&) = delete;
  Guide& operator=(const Guide&) = delete;
  virtual ~Guide() = default;
  /// What is captured and the first step.
  virtual void introduce(std::ostream& out) = 0;
  /// A line from the balance's data output, and what to say about it (with the next step).
  virtual void port_line(const std::string& bytes, const std::string& received_at, std::ostream& out) = 0;
  /// A line typed at the prompt (a reading when there is no port, or a value the step asks to be typed).
  virtual void typed(const std::string& text, const std::string& received_at, std::ostream& out) = 0;
  /// Whether the current step takes its value from the keyboard even when the readings come from the port.
  [[nodiscard]] virtual bool wants_typed() const = 0;
  [[nodiscard]] virtual bool complete() const = 0;
  /// How far it got, for the sentence of a capture ended short: "3 of 10 readings".
  [[nodiscard]] virtual std::string progress() const = 0;
  /// The balance's port settings (for its send command), when it has any.
  [[nodiscard]] virtual const std::optional<store::BalancePort>& port_settings() const = 0;
};

/// Runs the capture. `port` is the balance's data output, or null for readings typed on `keyboard_fd`.
SessionResult run_session(Guide& guide, ByteSource* port, int keyboard_fd, std::ostream& out);

/// Now, UTC, ISO 8601 with milliseconds: when a line arrived.
std::string arrival_time();

/// How the operator gives the next reading: typed, by the balance's send command (Enter), or its print key.
std::string how_to_read(const ByteSource* port, const std::optional<store::BalancePort>& settings);

}  // namespace plumb::capture
