#pragma once
// JSON of a check run of any procedure (`check show --format json`, certificates): the run's metadata,
// weights and readings beside the results stored with it.
#include <nlohmann/json.hpp>
#include <vector>

#include "checks/verdict.hpp"
#include "store/records.hpp"

namespace plumb::report {

/// The pass/fail criteria of a result, each with its measured value and limit in grams.
nlohmann::json criteria_json(const std::vector<Criterion>& criteria);

/// The full JSON of `check show`: run metadata, weights, readings and the stored results.
nlohmann::json run_json(const store::RunRecord& run);

}  // namespace plumb::report
