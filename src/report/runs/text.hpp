#pragma once
// Plain-text summary of one check run (`plumb check show`).
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::report {

/// `run` is the JSON of report::run_json.
std::string run_text(const nlohmann::json& run);

}  // namespace plumb::report
