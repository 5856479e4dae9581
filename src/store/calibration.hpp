#pragma once
// Records of full balance calibrations (schema/003_calibration.sql): the per-balance calibration settings
// (append-only; the latest row is current) and the structure of each calibration run (environment, loads
// and the weights and certificates that made them up, where each reading belongs).
#include <SQLiteCpp/Database.h>

#include <map>
#include <optional>
#include <string>
#include <vector>

#include "core/dates.hpp"
#include "core/units.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::store {

struct CalibrationSettings {
  std::int64_t id = 0;
  std::string instrument_id;
  std::optional<std::string> accuracy_class;        ///< "I" .. "IIII"
  std::optional<ExactMass> verification_interval;   ///< e
  std::string tolerance = "r76";                    ///< r76 | usp41 | lab
  std::optional<ExactMass> lab_limit;
  std::optional<Decimal> lab_percent;
  std::string decision_rule = "simple";             ///< simple | guard-band
  Interval calibrate_every;
  Date effective_on;
  std::string created_at;
  std::string created_by;
};

struct CalibrationLoadWeight {
  std::string weight_id;
  std::int64_t weight_calibration_id = 0;
};

struct CalibrationLoad {
  std::string stage;  ///< as-found | as-left
  std::string part;   ///< repeatability | eccentricity | indication
  int load_no = 0;
  std::string combination;
  ExactMass nominal;
  ExactMass conventional;
  std::vector<CalibrationLoadWeight> weights;
};

struct CalibrationReadingPlace {
  int seq = 0;  ///< the reading's seq in `readings`
  std::string stage, part;
  int load_no = 0;
  std::optional<std::string> position, direction;
};

struct CalibrationRunDetails {
  std::int64_t run_id = 0;
  std::int64_t settings_id = 0;
  std::string model;
  std::optional<std::string> temperature_c, pressure_hpa, humidity_pct;
  std::string air_density_kg_m3, u_air_density, air_method;
  std::string as_found_state;
  std::optional<std::string> as_left_state;
  std::vector<CalibrationLoad> loads;
  std::vector<CalibrationReadingPlace> places;
};

/// The current settings of a balance (latest row), if any.
std::optional<CalibrationSettings> find_calibration_settings(SQLite::Database& db, const std::string& instrument_id);
/// The current settings of every balance that has any, by instrument id (one query, for lab-wide lists).
std::map<std::string, CalibrationSettings> all_current_calibration_settings(SQLite::Database& db);
/// Appends a settings row (superseding the previous one); returns its id.
std::int64_t add_calibration_settings(Recorder& rec, const CalibrationSettings& s);

/// Adds the calibration rows of run `details.run_id` to the run's group (see store::add_run).
void add_calibration_details(RowGroup& group, const CalibrationRunDetails& details);
std::optional<CalibrationRunDetails> find_calibration_details(SQLite::Database& db, std::int64_t run_id);

/// All certificates of a weight calibrated on or before `on`, oldest first (for the drift between them).
std::vector<WeightCalibration> weight_calibrations_until(SQLite::Database& db, const std::string& weight_id, Date on);

/// The latest non-superseded run of an instrument with (include = true) or without (false) `procedure`.
std::optional<RunRecord> latest_run_by_procedure(SQLite::Database& db, const std::string& instrument_id,
                                                 checks::Procedure procedure, bool include);

}  // namespace plumb::store
