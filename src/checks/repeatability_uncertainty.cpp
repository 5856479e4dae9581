#include "checks/repeatability_uncertainty.hpp"

#include <fmt/format.h>

#include <cmath>
#include <vector>

#include "core/errors.hpp"
#include "stats/uncertainty_budget.hpp"

namespace plumb::checks {

RepeatabilityUncertainty repeatability_uncertainty(const RepeatabilityUncertaintyInput& in) {
  if (in.n < 1) throw InputError(fmt::format("readings: {} given; the bias needs at least one.", in.n));
  if (in.weight_expanded_u && !(in.weight_k > 0))
    throw InputError(fmt::format("reference weight k: {} is not a positive coverage factor.", in.weight_k));
  const double n = static_cast<double>(in.n);
  // The budget library does the root sum of squares; values in grams.
  std::vector<stats::Contribution> inputs;
  inputs.push_back(stats::Contribution::type_a("scatter of the mean, s / sqrt(n)", in.sd.g() / std::sqrt(n),
                                               in.n > 1 ? n - 1.0 : stats::infinite_dof));
  if (in.weight_expanded_u)
    inputs.push_back(stats::Contribution::expanded("reference weight, U / k", in.weight_expanded_u->g(), in.weight_k));
  inputs.push_back(stats::Contribution::rounding("rounding of the zero indication", in.readability.g()));
  stats::BudgetOptions options;
  options.fixed_k = weekly_check_coverage_k;
  const stats::BudgetResult bias = stats::combine("bias", "g", std::move(inputs), options);

  RepeatabilityUncertainty u;
  u.bias_standard = Mass::grams(bias.combined);
  u.bias_expanded = Mass::grams(bias.expanded);
  u.sd_expanded =
      in.n > 1 ? Mass::grams(weekly_check_coverage_k * in.sd.g() / std::sqrt(2.0 * (n - 1.0))) : Mass::grams(0.0);
  return u;
}

}  // namespace plumb::checks
