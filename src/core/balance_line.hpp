#pragma once
// One line of a balance's data output read as a reading: the value exactly as displayed, its unit, and
// whether the balance marked it stable. The common line shapes are built in; a lab describes another shape
// with a LinePattern (syntax in doc/capture.md). Pure: no I/O.
#include <optional>
#include <regex>
#include <string>
#include <string_view>
#include <vector>

#include "core/decimal.hpp"
#include "core/units.hpp"

namespace plumb {

/// A line that reads as a reading (its unit may still be one plumb does not weigh in).
struct BalanceLineReading {
  std::string text;              ///< the value as displayed: sign (only "-"), digits and decimals, trailing zeros kept
  Decimal value;                 ///< exact, with the scale displayed
  std::string unit_text;         ///< the unit as printed, e.g. "g", "mg"
  std::optional<MassUnit> unit;  ///< empty when unit_text is not a mass unit plumb knows
  bool stable = true;            ///< false when the line carries the balance's unstable mark
};

/// A lab-defined line shape. Pattern text: {value} (a sign, spaces, digits, decimals), {unit} (the unit
/// letters), optionally {mark:STABLE|UNSTABLE} (the stability mark; either text may be empty), a space (any run
/// of spaces or tabs, or none), * (any text), \ before a character that is to stand for itself; every other
/// character stands for itself. The whole line (trimmed, without its line end) must match.
class LinePattern {
 public:
  /// Throws InputError naming `field` for a pattern without {value} and {unit} once each, an unknown {...},
  /// a mark without its "|", or a control character.
  static LinePattern parse(std::string_view pattern, std::string_view field);
  [[nodiscard]] const std::string& text() const { return text_; }
  /// The reading in `line`, when the whole line has this shape.
  [[nodiscard]] std::optional<BalanceLineReading> match(std::string_view line) const;

 private:
  std::string text_;
  std::regex regex_;
  int value_group_ = 0, unit_group_ = 0, mark_group_ = 0;  ///< 0: not in the pattern
  std::string stable_mark_;
};

/// The common shapes plumb tries in order when the balance has no pattern of its own (doc/capture.md).
const std::vector<LinePattern>& common_line_shapes();

/// The reading in one received line (without its line end), by `pattern` when given, else by the common shapes;
/// empty when the line is not a reading (a header, an error code, garbage).
std::optional<BalanceLineReading> read_balance_line(std::string_view line, const LinePattern* pattern = nullptr);

/// A received line as stored and shown: printable ASCII as it came, a backslash doubled, every other byte
/// \xHH. Keeps garbage bytes visible and the stored text valid UTF-8.
std::string escaped_line(std::string_view raw);

}  // namespace plumb
