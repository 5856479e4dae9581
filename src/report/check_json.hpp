#pragma once
// JSON forms of check results. Quantities are numbers in grams (keys end in _g) or percent (_pct).
#include <nlohmann/json.hpp>

#include "checks/repeatability.hpp"
#include "store/records.hpp"

namespace plumb::report {

nlohmann::json to_json(const checks::RepeatabilityResult& r);
nlohmann::json criteria_json(const std::vector<Criterion>& criteria);

/// The full JSON of `check show`: run metadata, weights, readings and the stored results.
nlohmann::json run_json(const store::RunRecord& run);

}  // namespace plumb::report
