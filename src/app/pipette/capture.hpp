#pragma once
// A pipette's gravimetric check taken at the bench, step by step (plumb check capture P --procedure gravimetric):
// the water temperature typed at the start, the evaporation blank when the lab takes one, then every weighing of
// every test volume and channel in turn (as many replicates as the pipette's edition of ISO 8655 asks for), each
// from the balance's data output (or typed) and judged the moment it arrives, and the water temperature typed at
// the end. The run is then recorded by the same function as `check record --procedure gravimetric`, with every
// line kept as its original record. Nothing is written before that; dropping the object writes nothing.
//
// The water temperature of the run is the mean of the two typed at the start and the end: the conversion factor Z
// takes one temperature, and ISO 8655-6 has the water's temperature taken at the start and end of the weighings
// and their mean used (recalled from memory of ISO 8655-6:2002, clause 7; not checked against the published text).
#include <optional>
#include <string>
#include <vector>

#include "app/bench/balance_lines.hpp"
#include "app/pipette/record.hpp"
#include "checks/pipette_edition.hpp"
#include "store/pipettes.hpp"

namespace plumb::app {

struct PipetteCaptureInput {
  /// Pipette, balance, pressure, humidity, evaporation (when entered), uncertainties, date, operator; the water
  /// temperature and the weighings are captured.
  PipetteCheckInput check;
  /// Takes the evaporation blank at the bench (instead of --evaporation): one reading of the tared vessel after a
  /// weighing cycle's time with nothing dispensed; the mass it lost is added to every weighing.
  bool evaporation_blank = false;
  /// Replicates per test volume and channel; 0: the number the pipette's edition asks for.
  int replicates = 0;
  /// Where the port lines come from, for messages; "typed" for the prompt.
  std::string source = "typed";
  /// The unit of a bare typed number, and of port lines when the balance has no port settings.
  MassUnit unit = MassUnit::g;
};

/// One weighing the capture asks for.
struct PipetteSlot {
  ExactVolume volume;
  int channel = 1;
  int replicate = 1;  ///< 1-based within its volume and channel
};

class PipetteCapture {
 public:
  enum class Phase { start_temperature, blank, weighing, end_temperature, done };

  /// Validates everything but the captured values now (pipette, balance in service and in date, options), so a
  /// wrong one is said before the first weighing. Throws InputError.
  PipetteCapture(store::Database& db, const PipetteCaptureInput& in);

  CaptureStep take_port_line(const std::string& bytes, const std::string& received_at);
  CaptureStep take_typed(const std::string& text, const std::string& received_at);

  [[nodiscard]] Phase phase() const;
  /// Whether the current step is a value typed at the prompt even when the readings come from the port.
  [[nodiscard]] bool wants_typed() const;
  [[nodiscard]] bool complete() const { return phase() == Phase::done; }
  [[nodiscard]] const PipetteSlot& next_slot() const { return slots_.at(weighings_.size()); }
  [[nodiscard]] int weighings_taken() const { return static_cast<int>(weighings_.size()); }
  [[nodiscard]] int weighings_wanted() const { return static_cast<int>(slots_.size()); }
  [[nodiscard]] int replicates() const { return replicates_; }
  [[nodiscard]] checks::Iso8655Edition edition() const { return edition_; }
  [[nodiscard]] const store::PipetteRecord& pipette() const { return pipette_; }
  [[nodiscard]] const store::BalanceRecord& balance() const { return lines_.balance(); }
  [[nodiscard]] const std::optional<store::BalancePort>& port() const { return lines_.port(); }
  [[nodiscard]] MassUnit expected_unit() const { return lines_.unit(); }
  [[nodiscard]] bool takes_blank() const { return in_.evaporation_blank; }
  /// After a counted weighing: the last one, and n, mean and s of its volume and channel so far (grams, as text).
  [[nodiscard]] const PipetteWeighing& last_weighing() const { return weighings_.back(); }
  [[nodiscard]] std::string series_summary() const;
  /// The temperatures typed (as read, degC) and the evaporation blank (the mass lost), once taken.
  [[nodiscard]] const std::optional<Decimal>& start_temperature() const { return start_c_; }
  [[nodiscard]] const std::optional<Decimal>& end_temperature() const { return end_c_; }
  [[nodiscard]] const std::optional<std::string>& evaporation() const { return evaporation_; }
  /// The run's water temperature: the mean of start and end, exact (one decimal more than the finer of the two).
  [[nodiscard]] Decimal mean_temperature() const;

  /// Records the run and its lines in one transaction (InputError when not complete).
  store::RunRecord record(const store::Actor& actor);

 private:
  CaptureStep take_weighing(const JudgedLine& line);
  CaptureStep take_blank(const JudgedLine& line);
  CaptureStep take_temperature(const std::string& text, const std::string& received_at);
  [[nodiscard]] ReadingRule rule() const;

  store::Database& db_;
  PipetteCaptureInput in_;
  store::PipetteRecord pipette_;
  checks::Iso8655Edition edition_ = checks::Iso8655Edition::e2002;
  BenchLines lines_;
  int replicates_ = 0;
  std::vector<PipetteSlot> slots_;
  std::vector<PipetteWeighing> weighings_;
  std::optional<Decimal> start_c_, end_c_;
  std::optional<std::string> evaporation_;
};

}  // namespace plumb::app
