#pragma once
// JSON of a weekly check's results (procedure repeatability), stored with the run. Quantities are numbers in
// grams (keys end in _g) or percent (_pct).
#include <nlohmann/json.hpp>
#include <string>
#include <string_view>

#include "checks/repeatability.hpp"

namespace plumb::report {

nlohmann::json to_json(const checks::RepeatabilityResult& r);
/// What a repeatability run stores: to_json(r) with the balance's policy key and name, written straight to
/// JSON text (the same members, in nlohmann's sorted order; a batch import stores one per run).
std::string repeatability_results_text(const checks::RepeatabilityResult& r, std::string_view policy_key,
                                       std::string_view policy_name);

}  // namespace plumb::report
