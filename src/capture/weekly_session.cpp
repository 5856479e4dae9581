#include "capture/weekly_session.hpp"

#include <fmt/ostream.h>

#include <ostream>

namespace plumb::capture {
namespace {

class WeeklyGuide final : public Guide {
 public:
  WeeklyGuide(app::WeeklyCapture& capture, ByteSource* port) : capture_(capture), port_(port) {}

  void introduce(std::ostream& out) override {
    const auto& b = capture_.balance();
    const auto& w = capture_.weight();
    fmt::print(out, "Weekly check of {} (capacity {}, d = {}) with {} (conventional mass {}): {} readings.\n", b.id,
               b.capacity.to_string(), b.readability.to_string(), w.id, w.conventional_mass().to_string(),
               capture_.wanted());
    if (port_)
      fmt::print(out, "Readings come from {} in {}; only stable readings are counted.\n", port_->name(),
                 to_string(capture_.expected_unit()));
    else
      fmt::print(out, "Type each reading exactly as the balance displays it (a bare number is in {}).\n",
                 to_string(capture_.expected_unit()));
    fmt::print(out, "Type stop (or press Ctrl-C) to stop: nothing is written until the last reading is in.\n");
    fmt::print(out, "Step: with the pan empty, zero (tare) the balance.\n");
    ask(out);
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
    return fmt::format("{} of {} readings", capture_.counted(), capture_.wanted());
  }
  [[nodiscard]] const std::optional<store::BalancePort>& port_settings() const override { return capture_.port(); }

 private:
  void ask(std::ostream& out) const {
    fmt::print(out, "Reading {} of {}: place {} on the centre of the pan; when the display is stable, {}\n",
               capture_.counted() + 1, capture_.wanted(), capture_.weight().id, how_to_read(port_, capture_.port()));
  }

  void said(const app::CaptureStep& step, std::ostream& out) const {
    if (step.outcome != app::CaptureStep::Outcome::counted) {
      fmt::print(out, "  {}\n", step.message);
      return;
    }
    const auto s = capture_.summary();
    const auto& last = capture_.last_counted();
    fmt::print(out, "  reading {} counted: {} {}   n = {}, mean = {}{}\n", s.n, last.text, to_string(last.unit), s.n,
               s.mean, s.sd.empty() ? "" : ", s = " + s.sd);
    if (step.far_warning)
      fmt::print(out, "  warning: reading {} is far from the others: {}.\n", s.n, *step.far_warning);
    if (!capture_.complete()) {
      fmt::print(out, "Step: remove {} from the pan and check that the balance returns to zero.\n",
                 capture_.weight().id);
      ask(out);
    } else {
      fmt::print(out, "Step: remove {} from the pan. All {} readings are in.\n", capture_.weight().id,
                 capture_.wanted());
    }
  }

  app::WeeklyCapture& capture_;
  ByteSource* port_;
};

}  // namespace

SessionResult run_weekly_session(app::WeeklyCapture& capture, ByteSource* port, int keyboard_fd, std::ostream& out) {
  WeeklyGuide guide(capture, port);
  return run_session(guide, port, keyboard_fd, out);
}

}  // namespace plumb::capture
