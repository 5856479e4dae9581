#pragma once
// The weekly check at the bench, on the terminal: says what to do next, takes each line from the balance (or
// each reading typed), says what became of it with the running n, mean and s, and ends when the check has its
// readings (capture/session runs the loop). Writes nothing: the caller records a complete capture through
// app::WeeklyCapture::record.
#include <iosfwd>

#include "app/weekly_check/capture.hpp"
#include "capture/byte_source.hpp"
#include "capture/session.hpp"

namespace plumb::capture {

/// Runs the capture. `port` is the balance's data output, or null for readings typed on `keyboard_fd`.
SessionResult run_weekly_session(app::WeeklyCapture& capture, ByteSource* port, int keyboard_fd, std::ostream& out);

}  // namespace plumb::capture
