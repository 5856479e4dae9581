// Fuzzes the calibration run file and plan parsers (app/calibration/run_file), the text `check record --procedure
// calibration --readings` and `check capture --procedure calibration --plan` read: any bytes give rows or raise
// InputError. Every row's line lies within the text, its stage, part, position and direction are among the words
// the parsers accept, a plan's rows carry no reading, and a run file's readings re-parse from their own text.
#include <algorithm>
#include <cstdint>
#include <cstdlib>
#include <string_view>

#include "app/calibration/run_file.hpp"
#include "checks/eccentricity.hpp"
#include "core/errors.hpp"

namespace {

void check_row(const plumb::app::CalibrationRow& r, int lines) {
  if (r.line < 2 || r.line > lines) std::abort();
  if (r.stage != "as-found" && r.stage != "as-left") std::abort();
  if (r.part != "repeatability" && r.part != "eccentricity" && r.part != "indication") std::abort();
  if (r.load.empty()) std::abort();
  const auto& positions = plumb::checks::pan_positions;
  if (r.part == "eccentricity" && std::find(positions.begin(), positions.end(), r.position) == positions.end())
    std::abort();
  if (r.part == "indication" && r.direction != "up" && r.direction != "down") std::abort();
  if (r.part != "eccentricity" && !r.position.empty()) std::abort();
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  const auto lines = static_cast<int>(std::count(text.begin(), text.end(), '\n')) + 1;
  try {
    for (const auto& r : plumb::app::parse_calibration_plan(text, "fuzz-plan.csv")) {
      check_row(r, lines);
      if (!r.reading.text.empty()) std::abort();
    }
  } catch (const plumb::InputError&) {
  }
  try {
    for (const auto& r : plumb::app::parse_calibration_csv(text, "fuzz.csv", plumb::MassUnit::g)) {
      check_row(r, lines);
      if (plumb::Decimal::parse(r.reading.text) != r.reading.value) std::abort();
    }
  } catch (const plumb::InputError&) {
  }
  return 0;
}
