#pragma once
// Plain-text summary of one gravimetric pipette run (`plumb check show` for procedure gravimetric).
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

namespace plumb::report {

/// `run` is the JSON of report::run_json for a gravimetric run.
std::string pipette_run_text(const nlohmann::json& run);

/// The results table shared with the certificate: one row per test volume and channel.
std::vector<std::string> pipette_results_table(const nlohmann::json& run);

/// Decimals for volumes near `selected_ul`: 5 at 1 uL, 3 at 100 uL, 1 at 10 mL (as checks/pipette.cpp).
int pipette_volume_decimals(double selected_ul);

}  // namespace plumb::report
