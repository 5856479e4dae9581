#pragma once
// The calibration run file: one reading per row, each saying where it belongs.
//
//   stage,part,load,position,direction,reading,unit
//   as-found,repeatability,W100,,,100.0003,g
//   as-found,eccentricity,W100,centre,,100.0002,g
//   as-found,eccentricity,W100,front-left,,100.0004,g
//   as-found,indication,W100+W50,,up,150.0005,g
//   as-found,indication,W100+W50,,down,150.0006,g
//   as-left,indication,W100+W50,,up,150.0001,g
//
// stage: as-found | as-left. part: repeatability | eccentricity | indication. load: the reference weights
// on the pan, joined by '+'. position: eccentricity only, one of checks::pan_positions (centre, front-left,
// front-right, back-left, back-right, front, back, left, right; "center" is read as centre), one of them
// "centre". direction: indication only, up (default) or down. unit: optional (else --unit).
// Columns may come in any order; position, direction and unit may be left out.
#include <string>
#include <string_view>
#include <vector>

#include "core/units.hpp"

namespace plumb::app {

struct CalibrationRow {
  int line = 0;  ///< 1-based line in the file
  std::string stage, part, load, position, direction;
  MassReading reading;
};

inline constexpr std::string_view calibration_csv_header = "stage,part,load,position,direction,reading,unit";
inline constexpr std::string_view calibration_plan_header = "stage,part,load,position,direction";

/// Parses and checks each field of each row (not yet against the balance or the weights). Throws
/// InputError naming the file, line, column and value.
std::vector<CalibrationRow> parse_calibration_csv(std::string_view text, std::string_view source,
                                                  MassUnit default_unit);

/// A calibration plan (`check capture --procedure calibration --plan FILE`): the rows of a run file in the order
/// they are to be weighed, without the reading and unit columns; each row is checked as in a run file. The rows'
/// readings are empty until captured.
std::vector<CalibrationRow> parse_calibration_plan(std::string_view text, std::string_view source);

}  // namespace plumb::app
