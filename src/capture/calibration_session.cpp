#include "capture/calibration_session.hpp"

#include <fmt/ostream.h>

#include <ostream>

namespace plumb::capture {
namespace {

std::string stage_words(const std::string& stage) {
  return stage == "as-left" ? "as left" : "as found";
}

std::string position_words(const std::string& position) {
  std::string out;
  for (const char c : position) out += c == '-' ? ' ' : c;
  return out;
}

class CalibrationGuide final : public Guide {
 public:
  CalibrationGuide(app::CalibrationCapture& capture, ByteSource* port) : capture_(capture), port_(port) {}

  void introduce(std::ostream& out) override {
    const auto& b = capture_.balance();
    fmt::print(out, "Calibration of {} (capacity {}, d = {}): {} readings as the plan lists them.\n", b.id,
               b.capacity.to_string(), b.readability.to_string(), capture_.wanted());
    if (port_)
      fmt::print(out, "Readings come from {} in {}; only stable readings are counted.\n", port_->name(),
                 to_string(capture_.expected_unit()));
    else
      fmt::print(out, "Type each reading exactly as the balance displays it (a bare number is in {}).\n",
                 to_string(capture_.expected_unit()));
    fmt::print(out, "Type stop (or press Ctrl-C) to stop: nothing is written until the last reading is in.\n");
    fmt::print(out, "Step: with the pan empty, zero (tare) the balance.\n");
    ask(out, nullptr);
  }

  void port_line(const std::string& bytes, const std::string& received_at, std::ostream& out) override {
    said(capture_.take_port_line(bytes, received_at), out);
  }
  void typed(const std::string& text, const std::string& received_at, std::ostream& out) override {
    said(capture_.take_typed(text, received_at), out);
  }
  [[nodiscard]] bool wants_typed() const override { return false; }
  [[nodiscard]] bool complete() const override { return capture_.complete(); }
  [[nodiscard]] std::string progress() const override {
    return fmt::format("{} of {} readings", capture_.taken(), capture_.wanted());
  }
  [[nodiscard]] const std::optional<store::BalancePort>& port_settings() const override { return capture_.port(); }

 private:
  /// The next row's step; `before` is the row just read, so a new series or stage is announced once.
  void ask(std::ostream& out, const app::CalibrationRow* before) const {
    const auto& r = capture_.next_row();
    if (!before || before->stage != r.stage)
      fmt::print(out, "Stage: the balance {}{}.\n", stage_words(r.stage),
                 r.stage == "as-left" ? " (after the adjustment)" : " (before any adjustment)");
    const std::string weights = app::weights_named(r.load);
    const auto [k, n] = capture_.place_in_series(r);
    std::string what;
    if (r.part == "eccentricity")
      what = fmt::format("eccentricity, {} at the {} of the pan", weights, position_words(r.position));
    else if (r.part == "repeatability")
      what = fmt::format("repeatability, {} on the centre of the pan, reading {} of {}", weights, k, n);
    else
      what = fmt::format("indication, {} on the centre of the pan, loading {}", weights, r.direction);
    const bool new_series = !before || before->part != r.part || before->load != r.load || before->stage != r.stage;
    if (new_series && r.part == "repeatability")
      fmt::print(out, "Step: place {} on the centre, read, remove it, and again for each reading of the series.\n",
                 weights);
    fmt::print(out, "Reading {} of {} ({}, plan line {}): {}; when the display is stable, {}\n", capture_.taken() + 1,
               capture_.wanted(), stage_words(r.stage), r.line, what, how_to_read(port_, capture_.port()));
  }

  void said(const app::CaptureStep& step, std::ostream& out) const {
    if (step.outcome != app::CaptureStep::Outcome::counted) {
      fmt::print(out, "  {}\n", step.message);
      return;
    }
    const auto& last = capture_.last_row();
    fmt::print(out, "  reading {} counted: {} {} ({}, {}{})\n", capture_.taken(), last.reading.text,
               to_string(last.reading.unit), last.part, app::weights_named(last.load),
               last.position.empty() ? std::string() : ", " + position_words(last.position));
    if (!capture_.complete()) {
      fmt::print(out, "Step: remove the load and check that the balance returns to zero.\n");
      ask(out, &last);
    } else {
      fmt::print(out, "Step: remove the load. All {} readings are in.\n", capture_.wanted());
    }
  }

  app::CalibrationCapture& capture_;
  ByteSource* port_;
};

}  // namespace

SessionResult run_calibration_session(app::CalibrationCapture& capture, ByteSource* port, int keyboard_fd,
                                      std::ostream& out) {
  CalibrationGuide guide(capture, port);
  return run_session(guide, port, keyboard_fd, out);
}

}  // namespace plumb::capture
