#pragma once
// What a lab stated about a reference weight's density and drift (schema/009_weight_properties.sql): one row per
// statement, the latest in force, every earlier one kept with who entered it and when.
#include <SQLiteCpp/Database.h>

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "core/decimal.hpp"
#include "core/units.hpp"
#include "store/recorder.hpp"

namespace plumb::store {

struct WeightProperties {
  std::int64_t id = 0;
  std::string weight_id;
  /// Exactly one of: an entered density with its standard uncertainty (kg/m3), or the OIML R 111 class whose
  /// density limits stand for it.
  std::optional<Decimal> density_kg_m3, u_density_kg_m3;
  std::optional<std::string> density_class;
  std::optional<ExactMass> drift;  ///< drift allowance D
  std::string by_name, recorded_at;
};

/// Every statement for the weight, oldest first.
std::vector<WeightProperties> weight_properties_history(SQLite::Database& db, const std::string& weight_id);
/// The statement in force (the latest), if any.
std::optional<WeightProperties> weight_properties_in_force(SQLite::Database& db, const std::string& weight_id);
std::int64_t add_weight_properties(Recorder& rec, const WeightProperties& p);

}  // namespace plumb::store
