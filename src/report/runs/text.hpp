#pragma once
// Plain-text summary of one check run of any procedure (`plumb check show`), chosen by the procedure.
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::report {

/// `run` is the JSON of report::run_json.
std::string run_text(const nlohmann::json& run);

}  // namespace plumb::report
