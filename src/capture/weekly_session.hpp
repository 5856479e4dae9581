#pragma once
// The weekly check at the bench, on the terminal: says what to do next, takes each line from the balance (or
// each reading typed), says what became of it with the running n, mean and s, and ends when the check has its
// readings, or when it is stopped, interrupted or the line closes. Writes nothing: the caller records a complete
// capture through app::WeeklyCapture::record.
#include <iosfwd>
#include <string>

#include "app/weekly_check/capture.hpp"
#include "capture/byte_source.hpp"

namespace plumb::capture {

enum class SessionEnd { complete, stopped, interrupted, line_closed, input_ended };

struct SessionResult {
  SessionEnd end = SessionEnd::complete;
  /// Why it ended short, one sentence ending in "nothing was written." (after "plumb: ").
  std::string why;
};

/// Runs the capture. `port` is the balance's data output, or null for readings typed on `keyboard_fd`.
SessionResult run_weekly_session(app::WeeklyCapture& capture, ByteSource* port, int keyboard_fd, std::ostream& out);

/// Now, UTC, ISO 8601 with milliseconds: when a line arrived.
std::string arrival_time();

}  // namespace plumb::capture
