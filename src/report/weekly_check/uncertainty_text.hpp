#pragma once
// The weekly check's expanded uncertainties as every rendering prints them.
#include <nlohmann/json.hpp>

#include <string>

namespace plumb::report {

/// "U = 0.097 mg (k = 2)" from a run's stored `key` (grams) and "uncertainty_k"; empty for runs recorded before
/// the check stored its uncertainty.
std::string weekly_expanded_u_text(const nlohmann::json& run, const char* key);

/// The model behind those values, one sentence for a certificate (checks/repeatability_uncertainty.hpp).
std::string weekly_uncertainty_model_text();

}  // namespace plumb::report
