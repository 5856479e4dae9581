#pragma once
// What every guided capture at the bench does with a line from the balance (or a reading typed at the prompt):
// reads it by the balance's line pattern or the common shapes, judges it the moment it arrives (stable, in the
// unit the balance shows, within its capacity, and whatever the procedure's own rule adds), and keeps every line
// with its arrival time as the run's original record. Shared by the weekly check, the pipette's gravimetric check
// and the calibration's loads, so a line is judged and said the same way whatever is being captured.
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "core/balance_line.hpp"
#include "store/balance_ports.hpp"
#include "store/raw_lines.hpp"
#include "store/records.hpp"

namespace plumb::app {

/// What became of one line.
struct CaptureStep {
  enum class Outcome { counted, unstable, not_a_reading, refused };
  Outcome outcome = Outcome::refused;
  std::string message;                     ///< the sentence said at the bench (empty for a plain counted reading)
  std::optional<std::string> far_warning;  ///< a counted reading far from the others (weekly check)
};

/// The procedure's own rule for a reading that passed the common ones: throws InputError with the sentence
/// `check record` gives for the same reading in a file (`where` names the port or "typed" and the line).
using ReadingRule = std::function<void(const MassReading& reading, const std::string& where)>;

/// One line judged, not yet kept.
struct JudgedLine {
  CaptureStep step;
  std::optional<MassReading> reading;  ///< when counted
  std::string shown;                   ///< the line as stored (core/balance_line escaped_line)
  std::string source;                  ///< "port" or "typed"
  std::string received_at;
};

class BenchLines {
 public:
  /// `balance` is the balance weighed on; its port settings (when any) give the unit and the line pattern,
  /// else `unit_without_port`. `source` names the port in messages ("/dev/ttyUSB0"), "typed" for the prompt.
  BenchLines(store::BalanceRecord balance, std::optional<store::BalancePort> port, MassUnit unit_without_port,
             std::string source);

  /// A line from the balance's data output (without its line end).
  [[nodiscard]] JudgedLine port_line(const std::string& bytes, const std::string& received_at,
                                     const ReadingRule& rule) const;
  /// A reading typed at the prompt: a number as displayed, with or without its unit (a bare number is in the unit
  /// the balance shows).
  [[nodiscard]] JudgedLine typed(const std::string& text, const std::string& received_at,
                                 const ReadingRule& rule) const;
  /// A line that is not a reading in the current step (a port line while a temperature is asked for, a line after
  /// the last reading): said and kept, not counted.
  [[nodiscard]] JudgedLine not_now(const std::string& bytes, const std::string& source, const std::string& received_at,
                                   const std::string& why) const;
  /// Whether a reading above the balance's capacity is refused (the default). A calibration judges capacity on its
  /// loads instead: a full-capacity load on a balance that reads high is within its range.
  void refuse_above_capacity(bool refuse) { refuse_above_capacity_ = refuse; }
  /// The where of the next line: "/dev/pts/4 line 5" or "typed line 5".
  [[nodiscard]] std::string where_next(const std::string& source) const;

  /// Keeps the line; `reading_seq` is the reading it became in the run (when counted).
  void keep(const JudgedLine& line, std::optional<int> reading_seq);
  /// Keeps a typed value that is not a mass reading (a water temperature), counted with `note` saying its use.
  void keep_typed_value(const std::string& text, const std::string& received_at, const std::string& note);

  [[nodiscard]] const std::vector<store::RawLine>& lines() const { return lines_; }
  [[nodiscard]] const store::BalanceRecord& balance() const { return balance_; }
  [[nodiscard]] const std::optional<store::BalancePort>& port() const { return port_; }
  [[nodiscard]] MassUnit unit() const { return unit_; }
  [[nodiscard]] const std::string& source() const { return source_; }

 private:
  [[nodiscard]] CaptureStep judge(const BalanceLineReading& line, const std::string& where, const ReadingRule& rule,
                                  std::optional<MassReading>& counted) const;

  store::BalanceRecord balance_;
  std::optional<store::BalancePort> port_;
  std::optional<LinePattern> pattern_;
  MassUnit unit_ = MassUnit::g;
  std::string source_;
  bool refuse_above_capacity_ = true;
  std::vector<store::RawLine> lines_;
};

/// Text typed at the prompt without the spaces around it.
std::string trimmed_typed(const std::string& text);

}  // namespace plumb::app
