#pragma once
// Plain-text summary of one weekly check run (`plumb check show` of a repeatability run).
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::report {

/// `run` is the JSON of report::run_json for a repeatability run.
std::string repeatability_run_text(const nlohmann::json& run);

}  // namespace plumb::report
