#pragma once
// A reference weight's certificates over the years (schema/001_core.sql, weight_calibrations) and the class
// overrides a lab recorded for some of them (schema/007_weight_overrides.sql).
#include <SQLiteCpp/Database.h>

#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "core/units.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::store {

/// Why a certificate outside its weight's class was accepted, and by whom.
struct WeightClassOverride {
  std::int64_t weight_calibration_id = 0;
  std::string weight_class;
  std::optional<ExactMass> mpe;  ///< none: OIML R 111 Table 1 has no MPE for the class at the nominal value
  std::string beyond;            ///< "correction", "uncertainty", "correction and uncertainty" or "no MPE"
  std::string reason, by_name, recorded_at;
};

/// Every certificate of the weight, oldest first (by calibration date, then entry order): the order
/// app::certificate_in_force reads.
std::vector<WeightCalibration> weight_certificates(SQLite::Database& db, const std::string& weight_id);
/// The overrides of the weight's certificates, by certificate (weight_calibrations.id).
std::map<std::int64_t, WeightClassOverride> weight_class_overrides(SQLite::Database& db, const std::string& weight_id);
void add_weight_class_override(Recorder& rec, const WeightClassOverride& o);

}  // namespace plumb::store
