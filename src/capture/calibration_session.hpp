#pragma once
// A calibration's loads at the bench, on the terminal: each row of the plan in turn (the weights to place and
// where, the series it belongs to), what became of each line, and the end when every row has its reading
// (capture/session runs the loop). Writes nothing: the caller records through app::CalibrationCapture::record.
#include <iosfwd>

#include "app/calibration/capture.hpp"
#include "capture/byte_source.hpp"
#include "capture/session.hpp"

namespace plumb::capture {

SessionResult run_calibration_session(app::CalibrationCapture& capture, ByteSource* port, int keyboard_fd,
                                      std::ostream& out);

}  // namespace plumb::capture
