#pragma once
// A balance's declared terms of normal use (migration 015): what the uncertainty of a weighing result in use and
// the minimum weight from calibration are computed from. A change is a new row; the latest is in force.
#include <SQLiteCpp/Database.h>

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "core/decimal.hpp"
#include "core/units.hpp"
#include "store/recorder.hpp"

namespace plumb::store {

struct InUseTermsRecord {
  std::int64_t id = 0;
  std::string balance_id;
  ExactMass rounding_zero, rounding_load, repeatability;
  Decimal temperature_change_k, sensitivity_ppm_per_k;
  Decimal sample_density_kg_m3, sample_density_u_kg_m3, air_density_u_kg_m3;
  Decimal drift_ppm;
  bool error_corrected = false;
  std::string form = "linear";  ///< linear | quadratic-sum
  Decimal required_accuracy_pct, safety_factor;
  std::string reason;
  std::string created_at, created_by;
};

std::int64_t add_in_use_terms(Recorder& rec, const InUseTermsRecord& t);
/// Every row of the balance, oldest first.
std::vector<InUseTermsRecord> in_use_terms_history(SQLite::Database& db, const std::string& balance_id);
/// The terms in force: the latest row.
std::optional<InUseTermsRecord> current_in_use_terms(SQLite::Database& db, const std::string& balance_id);

}  // namespace plumb::store
