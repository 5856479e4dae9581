#pragma once
// The content of a balance calibration certificate (kind "balance_calibration", numbers CC-YEAR-NNNN), added
// to the common parts app/certificates/issue.cpp assembles. Each table is an array of flat objects so that a text,
// PDF or other rendering maps it directly.
#include <nlohmann/json.hpp>

#include "store/records.hpp"

namespace plumb::app {

/// Adds "calibration", "weights" (traceability), "decision_rule" and "uncertainty_statement" to `content`.
void add_calibration_content(const store::RunRecord& run, nlohmann::json& content);

}  // namespace plumb::app
