#pragma once
// One reference weight in full (`plumb weight show`), as text and JSON.
#include <cstdint>
#include <map>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "core/dates.hpp"
#include "store/records.hpp"
#include "store/status_events.hpp"
#include "store/weight_certificates.hpp"
#include "store/weight_properties.hpp"

namespace plumb::report {

struct WeightDetails {
  store::WeightRecord weight;                          ///< `current` is the latest certificate (by date, then entry)
  std::vector<store::WeightCalibration> certificates;  ///< oldest first
  std::map<std::int64_t, store::WeightClassOverride> overrides;  ///< by certificate id
  Date on;                                                       ///< the date "in force" refers to
  std::optional<std::int64_t> in_force_id;        ///< the certificate in force on `on`; none before the first
  bool overdue = false;                           ///< the certificate in force on `on` was past its due date
  std::optional<store::ServiceEvent> retirement;  ///< set while the weight is retired
  /// On `on`: "retired", "overdue", "in date" (the words of the due list) or "no certificate in force".
  std::string status;
  std::vector<store::WeightProperties> properties;  ///< density and drift statements, oldest first
  /// The density a calibration budget uses (none: it cannot be derived, and `density_source` says why).
  std::optional<double> density_kg_m3, u_density_kg_m3;
  std::string density_source;
};

std::string weight_details_text(const WeightDetails& d);
nlohmann::json weight_details_json(const WeightDetails& d);

}  // namespace plumb::report
