#pragma once
// JSON forms of check results. Quantities are numbers in grams (keys end in _g) or percent (_pct).
#include <nlohmann/json.hpp>

#include "checks/repeatability.hpp"
#include "store/records.hpp"

namespace plumb::report {

nlohmann::json to_json(const checks::RepeatabilityResult& r);
nlohmann::json criteria_json(const std::vector<Criterion>& criteria);
/// What a repeatability run stores: to_json(r) with the balance's policy key and name, written straight to
/// JSON text (the same members, in nlohmann's sorted order; a batch import stores one per run).
std::string repeatability_results_text(const checks::RepeatabilityResult& r, std::string_view policy_key,
                                       std::string_view policy_name);

/// The full JSON of `check show`: run metadata, weights, readings and the stored results.
nlohmann::json run_json(const store::RunRecord& run);

}  // namespace plumb::report
