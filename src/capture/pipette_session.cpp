#include "capture/pipette_session.hpp"

#include <fmt/ostream.h>

#include <ostream>

namespace plumb::capture {
namespace {

class PipetteGuide final : public Guide {
 public:
  PipetteGuide(app::PipetteCapture& capture, ByteSource* port) : capture_(capture), port_(port) {}

  void introduce(std::ostream& out) override {
    const auto& p = capture_.pipette().definition;
    const auto& b = capture_.balance();
    fmt::print(out,
               "Gravimetric check of pipette {} ({} channel(s)) to ISO 8655-6:{} on balance {} (d = {}): {} "
               "weighing(s), {} replicates at each test volume and channel.\n",
               p.id, p.channels, checks::key(capture_.edition()), b.id, b.readability.to_string(),
               capture_.weighings_wanted(), capture_.replicates());
    if (port_)
      fmt::print(out, "Weighings come from {} in {}; only stable readings are counted. Temperatures are typed.\n",
                 port_->name(), to_string(capture_.expected_unit()));
    else
      fmt::print(out, "Type each weighing exactly as the balance displays it (a bare number is in {}).\n",
                 to_string(capture_.expected_unit()));
    fmt::print(out, "Type stop (or press Ctrl-C) to stop: nothing is written until the last value is in.\n");
    next(out);
  }

  void port_line(const std::string& bytes, const std::string& received_at, std::ostream& out) override {
    said(capture_.take_port_line(bytes, received_at), out);
  }
  void typed(const std::string& text, const std::string& received_at, std::ostream& out) override {
    said(capture_.take_typed(text, received_at), out);
  }
  [[nodiscard]] bool wants_typed() const override { return capture_.wants_typed(); }
  [[nodiscard]] bool complete() const override { return capture_.complete(); }
  [[nodiscard]] std::string progress() const override {
    return fmt::format("{} of {} weighings", capture_.weighings_taken(), capture_.weighings_wanted());
  }
  [[nodiscard]] const std::optional<store::BalancePort>& port_settings() const override { return capture_.port(); }

 private:
  using Phase = app::PipetteCapture::Phase;

  void next(std::ostream& out) const {
    switch (capture_.phase()) {
      case Phase::start_temperature:
        fmt::print(out,
                   "Step: put the weighing vessel with water on the pan; let the water, the pipette and the tips "
                   "stand in the room until they are at its temperature.\n");
        fmt::print(out, "Water temperature at the start (degC, as the thermometer shows it, e.g. 20.5):\n");
        return;
      case Phase::blank:
        fmt::print(out,
                   "Evaporation blank: tare the balance with the vessel on it, wait as long as one weighing "
                   "cycle takes without dispensing, then {}\n",
                   how_to_read(port_, capture_.port()));
        return;
      case Phase::weighing: {
        const auto& slot = capture_.next_slot();
        const auto& p = capture_.pipette().definition;
        if (slot.replicate == 1)
          fmt::print(out, "Step: set pipette {} to {}{}; fit a new tip and pre-wet it.\n", p.id,
                     slot.volume.to_string(),
                     p.channels > 1 ? fmt::format(" and weigh channel {}", slot.channel) : std::string());
        fmt::print(out,
                   "Weighing {} of {} ({}, channel {}, replicate {} of {}): tare the balance, dispense into the "
                   "vessel; when the display is stable, {}\n",
                   capture_.weighings_taken() + 1, capture_.weighings_wanted(), slot.volume.to_string(), slot.channel,
                   slot.replicate, capture_.replicates(), how_to_read(port_, capture_.port()));
        return;
      }
      case Phase::end_temperature:
        fmt::print(out, "All {} weighings are in. Water temperature at the end (degC):\n", capture_.weighings_wanted());
        return;
      case Phase::done:
        fmt::print(out, "Water temperature of the run: {} degC, the mean of the start and the end (ISO 8655-6).\n",
                   capture_.mean_temperature().to_string());
        return;
    }
  }

  void said(const app::CaptureStep& step, std::ostream& out) const {
    const bool counted = step.outcome == app::CaptureStep::Outcome::counted;
    if (!counted) {
      fmt::print(out, "  {}\n", step.message);
      return;
    }
    if (!step.message.empty()) {
      fmt::print(out, "  {}\n", step.message);  // a temperature taken
    } else if (capture_.phase() != Phase::blank && capture_.takes_blank() && capture_.weighings_taken() == 0) {
      fmt::print(out, "  evaporation blank: {} lost per weighing cycle; added to each weighing.\n",
                 ExactMass::parse(*capture_.evaporation(), "the evaporation blank").to_string());
    } else {
      const auto& w = capture_.last_weighing();
      fmt::print(out, "  weighing {} counted: {} {}   {}\n", capture_.weighings_taken(), w.reading.text,
                 to_string(w.reading.unit), capture_.series_summary());
    }
    next(out);
  }

  app::PipetteCapture& capture_;
  ByteSource* port_;
};

}  // namespace

SessionResult run_pipette_session(app::PipetteCapture& capture, ByteSource* port, int keyboard_fd, std::ostream& out) {
  PipetteGuide guide(capture, port);
  return run_session(guide, port, keyboard_fd, out);
}

}  // namespace plumb::capture
