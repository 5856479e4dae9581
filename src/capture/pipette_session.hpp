#pragma once
// A pipette's gravimetric check at the bench, on the terminal: asks for the water temperature, the evaporation
// blank when the lab takes one, each weighing of each test volume and channel in turn with the running n, mean and
// s of its series, and the water temperature at the end (capture/session runs the loop). Writes nothing: the
// caller records a complete capture through app::PipetteCapture::record.
#include <iosfwd>

#include "app/pipette/capture.hpp"
#include "capture/byte_source.hpp"
#include "capture/session.hpp"

namespace plumb::capture {

SessionResult run_pipette_session(app::PipetteCapture& capture, ByteSource* port, int keyboard_fd, std::ostream& out);

}  // namespace plumb::capture
