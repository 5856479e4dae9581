#include "report/weekly_check/uncertainty_text.hpp"

#include <fmt/format.h>

#include "report/format/text.hpp"

namespace plumb::report {

std::string weekly_expanded_u_text(const nlohmann::json& run, const char* key) {
  if (!run.contains(key) || !run[key].is_number()) return {};
  return fmt::format("U = {} (k = {:g})", mass_text(run[key], 2), run.value("uncertainty_k", 2.0));
}

std::string weekly_uncertainty_model_text() {
  return "Uncertainty (GUM, JCGM 100:2008): u(bias)^2 = s^2/n + (U_w/k_w)^2 + d^2/12 (scatter of the mean, "
         "reference weight's certificate, rounding of the zero indication); u(s) = s / sqrt(2 (n - 1)) (GUM "
         "E.4.3); U = k u with k = 2, coverage probability about 95 %. Air buoyancy and eccentricity are not "
         "included: this is the uncertainty of the check, not a calibration budget.";
}

}  // namespace plumb::report
