#pragma once
// JSON of a full balance calibration result, stored with the run (check_runs.results_json) and read back by
// `check show`, the text renderings and certificates. Quantities are numbers in grams (keys ending _g); exact
// sums of weights are decimal strings; an infinite number of degrees of freedom is null. Structured so that
// each table of the certificate is one array of flat objects (easy to map onto a page layout).
#include <nlohmann/json.hpp>

#include "checks/calibration.hpp"
#include "checks/range_approximation.hpp"
#include "stats/regression.hpp"

namespace plumb::report {

nlohmann::json to_json(const checks::CalibrationResult& r);
nlohmann::json to_json(const stats::BudgetResult& b);
nlohmann::json to_json(const stats::Fit& f);
/// The fit back from its JSON (for the error at a load asked for later).
stats::Fit fit_from_json(const nlohmann::json& j);
/// "line" | "through-origin" | "quadratic"
std::string_view model_key(stats::Model m);
stats::Model parse_model(std::string_view text, std::string_view field = "--model");

/// The error and its uncertainty approximated over the range (checks/range_approximation) from one stored set
/// (as found or as left): its loads' mean readings, errors, u_c and k, in the form of the set's fitted model.
checks::RangeApproximation range_approximation_of(const nlohmann::json& set);
/// Its coefficients, formulas and the statement the certificate prints.
nlohmann::json to_json(const checks::RangeApproximation& a);

}  // namespace plumb::report
