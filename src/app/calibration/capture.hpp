#pragma once
// A balance calibration's loads taken at the bench, step by step (plumb check capture BAL --procedure calibration
// --plan FILE): the plan is the run file's rows without their readings (app/calibration/run_file.hpp), in the order
// they are to be weighed: each load with its weights named, the eccentricity positions in their order, the
// repeatability series, the indication (linearity) loads up and down, as found and as left. Each reading comes from
// the balance's data output (or typed) and is judged as it arrives; when the last row has its reading, the run is
// recorded by the same function as `check record --procedure calibration` with the plan's rows and these readings,
// and every line is kept as its original record. Nothing is written before that.
#include <optional>
#include <string>
#include <vector>

#include "app/bench/balance_lines.hpp"
#include "app/calibration/record.hpp"
#include "app/calibration/run_file.hpp"

namespace plumb::app {

struct CalibrationCaptureInput {
  /// Balance, environment, model, air formula, date, operator; the readings are captured.
  CalibrationRunInput run;
  std::string plan_text;    ///< the plan file's text
  std::string plan_source;  ///< its name, for messages
  /// Where the port lines come from, for messages; "typed" for the prompt.
  std::string source = "typed";
  /// The unit of a bare typed number, and of port lines when the balance has no port settings.
  MassUnit unit = MassUnit::g;
};

class CalibrationCapture {
 public:
  /// Reads the plan and checks it, the balance, its settings, the weights' certificates on the run date and the
  /// options as `check record` would, so a wrong one is said before the first reading. Throws InputError.
  CalibrationCapture(store::Database& db, const CalibrationCaptureInput& in);

  CaptureStep take_port_line(const std::string& bytes, const std::string& received_at);
  CaptureStep take_typed(const std::string& text, const std::string& received_at);

  [[nodiscard]] int taken() const { return taken_; }
  [[nodiscard]] int wanted() const { return static_cast<int>(rows_.size()); }
  [[nodiscard]] bool complete() const { return taken_ >= wanted(); }
  /// The row the next reading is for (while not complete), and the last one taken.
  [[nodiscard]] const CalibrationRow& next_row() const { return rows_.at(static_cast<std::size_t>(taken_)); }
  [[nodiscard]] const CalibrationRow& last_row() const { return rows_.at(static_cast<std::size_t>(taken_ - 1)); }
  /// The position of `row` within its series: the k-th reading of the same stage, part and load, and how many.
  [[nodiscard]] std::pair<int, int> place_in_series(const CalibrationRow& row) const;
  [[nodiscard]] const store::BalanceRecord& balance() const { return lines_.balance(); }
  [[nodiscard]] const std::optional<store::BalancePort>& port() const { return lines_.port(); }
  [[nodiscard]] MassUnit expected_unit() const { return lines_.unit(); }

  /// Records the calibration and its lines in one transaction (InputError when not complete).
  store::RunRecord record(const store::Actor& actor);

 private:
  CaptureStep take(const JudgedLine& line);

  store::Database& db_;
  CalibrationCaptureInput in_;
  std::vector<CalibrationRow> rows_;
  BenchLines lines_;
  int taken_ = 0;
};

/// The weights of a load for people: "W100 + W50".
std::string weights_named(const std::string& load);

}  // namespace plumb::app
