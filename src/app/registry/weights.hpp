#pragma once
// Registering a reference weight with its first calibration certificate. Inputs arrive as the user typed
// them; every field is validated here and named in the error when wrong.
#include <optional>
#include <string>

#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::app {

struct WeightInput {
  std::string id, nominal, weight_class, correction = "0g", uncertainty, k = "2", certificate, calibrated, due;
  std::optional<std::string> density;  ///< kg/m3; conventional 8000 when absent
};
store::WeightRecord add_weight(store::Database& db, const store::Actor& actor, const WeightInput& in);

}  // namespace plumb::app
