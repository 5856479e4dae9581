#pragma once
// A weekly check taken at the bench, reading by reading (plumb check capture): each line from the balance's
// data output (or typed at the prompt) is judged the moment it arrives, only stable readings are counted, and
// when enough are in, the check is recorded by the same function as `check record`, with every line received
// kept as the run's original record. Nothing is written before that; dropping the object writes nothing.
#include <optional>
#include <string>
#include <vector>

#include "app/bench/balance_lines.hpp"
#include "app/weekly_check/record.hpp"

namespace plumb::app {

struct CaptureInput {
  CheckInput check;  ///< instrument, weight, date, operator (readings_csv unused)
  /// Readings to take; 0: the number the balance's policy asks for.
  int count = 0;
  /// Where the port lines come from, for messages ("/dev/ttyUSB0"); "typed" for the prompt.
  std::string source = "typed";
  /// The unit a bare typed number is in, and the unit port lines must show when the balance has no port
  /// settings (otherwise the settings' unit).
  MassUnit unit = MassUnit::g;
};

/// The running summary after each counted reading, as text in grams.
struct CaptureSummary {
  int n = 0;
  std::string mean, sd;  ///< empty until there are enough readings
};

class WeeklyCapture {
 public:
  /// Validates everything but the readings now, so a wrong weight or an overdue certificate is said before the
  /// first reading. Throws InputError.
  WeeklyCapture(store::Database& db, const CaptureInput& in);

  /// A line from the balance's data output (the bytes without the line end) and when it arrived.
  CaptureStep take_port_line(const std::string& bytes, const std::string& received_at);
  /// A reading typed at the prompt: a number as displayed, with or without its unit.
  CaptureStep take_typed(const std::string& text, const std::string& received_at);

  [[nodiscard]] int wanted() const { return wanted_; }
  [[nodiscard]] int counted() const { return static_cast<int>(readings_.size()); }
  [[nodiscard]] bool complete() const { return counted() >= wanted_; }
  [[nodiscard]] CaptureSummary summary() const;
  [[nodiscard]] const store::BalanceRecord& balance() const { return setup_.balance; }
  [[nodiscard]] const store::WeightRecord& weight() const { return setup_.weight; }
  [[nodiscard]] const std::optional<store::BalancePort>& port() const { return lines_.port(); }
  [[nodiscard]] MassUnit expected_unit() const { return lines_.unit(); }
  [[nodiscard]] const std::vector<store::RawLine>& lines() const { return lines_.lines(); }
  /// The last reading counted, as displayed (after a counted step).
  [[nodiscard]] const MassReading& last_counted() const { return readings_.back().reading; }

  /// Records the check and its lines in one transaction (InputError when not complete).
  store::RunRecord record(const store::Actor& actor);

 private:
  CaptureStep take(JudgedLine line);

  store::Database& db_;
  CaptureInput in_;
  WeeklyCheckSetup setup_;
  BenchLines lines_;
  int wanted_ = 0;
  std::vector<CsvReading> readings_;
};

/// Whether `reading` is far from `others`: more than 4 times the larger of their sample SD and the readability d
/// from their mean, judged once at least 3 others are in. The warning sentence, or empty.
std::optional<std::string> far_from_others(const ExactMass& reading, const std::vector<ExactMass>& others,
                                           const ExactMass& readability);

}  // namespace plumb::app
