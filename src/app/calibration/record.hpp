#pragma once
// Recording a full balance calibration (`check record BAL --procedure calibration`): the run file
// (app/calibration/run_file.hpp) and the environment are validated entirely, against the balance, its
// calibration settings and the reference weights' certificates valid on the run date, before the first
// write; then the calibration is evaluated (checks/calibration.hpp) and stored in one transaction.
//
// Verdict and scheduling (plumb's decision, stated on the certificate):
// - The run passes only when the final set (as left if an adjustment was made, else as found) is a clear
//   pass at every load. "pass, not proven" is not accepted: under a guard band its interval reaches past the
//   limit, so conformity has not been shown. A pass schedules the next calibration one calibration interval
//   (settings --calibrate-every) after the run; anything else takes the balance out of service.
// - Weekly checks keep their own schedule (balance --every) and `due` lists the calibration on its own line.
//   A failed calibration puts the balance out of service whatever the weekly checks say; only a passing
//   calibration returns it. A passing calibration counts as a passing weekly check of its date (it covers
//   repeatability and accuracy with traceable weights), so it also clears an earlier failed weekly check and
//   the next weekly check falls due one weekly interval after it (app/status/due.cpp).
#include <nlohmann/json.hpp>
#include <optional>
#include <string>

#include "app/calibration/run_file.hpp"
#include "core/units.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"
#include "store/repository.hpp"

namespace plumb::app {

struct CalibrationRunInput {
  std::string instrument_id;
  std::string readings_csv;  ///< the run file's text
  /// Rows already read (a capture at the bench: the plan's rows with their captured readings); readings_csv is
  /// then not parsed.
  std::optional<std::vector<CalibrationRow>> parsed_rows;
  std::string readings_source;  ///< its name, for messages
  MassUnit default_unit = MassUnit::g;
  std::string on;
  std::string operator_name;
  std::optional<std::string> temperature_c, pressure_hpa, humidity_pct;  ///< all three, or none (not measured)
  /// Standard uncertainties of the thermometer, barometer and hygrometer (each optional; only with the three
  /// conditions), propagated into the air density's u.
  std::optional<std::string> temperature_u, pressure_u, humidity_u;
  std::string air_formula = "cipm2007";    ///< cipm2007 | oiml-r111
  std::string model = "line";              ///< line | through-origin | quadratic
  std::optional<std::int64_t> supersedes;  ///< a correction: the run this one replaces
  std::string reason;                      ///< why it replaces it (required with supersedes)
};

store::RunRecord record_calibration(store::Database& db, const store::Actor& actor, const CalibrationRunInput& in);
/// Inside a transaction the caller holds; `extra` adds rows of its own to the run's group (a capture's raw lines),
/// so the run's one audit record covers them.
std::int64_t record_calibration_in(store::Database& db, store::Recorder& rec, const CalibrationRunInput& in,
                                   const store::RunDetails& extra = {});
/// Checks everything record_calibration_in checks but the readings (in.parsed_rows: a plan's rows, readings
/// empty), writing nothing: a capture at the bench says a wrong weight, setting or option before the first reading.
void check_calibration_plan(store::Database& db, const CalibrationRunInput& in);

/// The fitted error of the final set of a stored calibration run at `load` (e.g. "120g"). Outside the calibrated
/// range: InputError, or with `extrapolate` a result marked as extrapolated.
nlohmann::json calibration_error_at(const store::RunRecord& run, const std::string& load, bool extrapolate);

}  // namespace plumb::app
