#pragma once
// How a balance is calibrated: its OIML R 76 accuracy class and verification scale interval e, the
// tolerance policy for the error of indication (r76 | usp41 | lab), the ILAC G8 decision rule
// (simple | guard-band) and the calibration interval. Kept apart from the weekly check interval of
// `balance add`: a calibration is due on its own schedule. Each change is a new row (append-only).
#include <optional>
#include <string>

#include "checks/calibration.hpp"
#include "store/calibration.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"

namespace plumb::app {

struct CalibrationSettingsInput {
  std::string instrument_id;
  std::optional<std::string> accuracy_class;  ///< --class I | II | III | IIII
  std::optional<std::string> e;               ///< --e 1mg
  std::string tolerance = "r76";              ///< --tolerance
  std::optional<std::string> lab_limit;       ///< --lab-limit 0.5mg
  std::optional<std::string> lab_percent;     ///< --lab-percent 0.05
  std::string decision_rule = "simple";       ///< --decision-rule
  std::string calibrate_every = "1y";         ///< --calibrate-every
  std::optional<std::string> since;           ///< first calibration due (default today)
};

/// Validates and appends the settings (superseding earlier ones). Throws InputError naming the option.
store::CalibrationSettings set_calibration_settings(store::Database& db, const store::Actor& actor,
                                                   const CalibrationSettingsInput& in);

/// The pure-layer forms of stored settings.
checks::CalibrationTolerance tolerance_of(const store::CalibrationSettings& s);
checks::DecisionRule rule_of(const store::CalibrationSettings& s);
/// One line for people: "class I, e = 1 mg, OIML R 76 (in service), guard band w = U, every 1y".
std::string describe(const store::CalibrationSettings& s);

}  // namespace plumb::app
