#include "stats/uncertainty_budget.hpp"

#include <fmt/format.h>

#include <cmath>

#include "core/errors.hpp"

namespace plumb::stats {

std::string_view to_string(Distribution d) {
  switch (d) {
    case Distribution::normal: return "normal";
    case Distribution::rectangular: return "rectangular";
    case Distribution::triangular: return "triangular";
    case Distribution::u_shaped: return "U-shaped";
    case Distribution::rounding: return "rounding";
  }
  return "?";
}

double standard_divisor(Distribution d) {
  switch (d) {
    case Distribution::normal: return 1.0;
    case Distribution::rectangular: return std::sqrt(3.0);
    case Distribution::triangular: return std::sqrt(6.0);
    case Distribution::u_shaped: return std::sqrt(2.0);
    case Distribution::rounding: return 2.0 * std::sqrt(3.0);
  }
  return 1.0;
}

double Contribution::contribution() const { return std::abs(sensitivity) * standard_uncertainty(); }

namespace {
Contribution make(std::string source, double value, Distribution d, double divisor, double c, double dof) {
  Contribution x;
  x.source = std::move(source);
  x.value = value;
  x.distribution = d;
  x.divisor = divisor;
  x.sensitivity = c;
  x.dof = dof;
  return x;
}
}  // namespace

Contribution Contribution::type_a(std::string source, double standard_u, double dof, double sensitivity) {
  return make(std::move(source), standard_u, Distribution::normal, 1.0, sensitivity, dof);
}
Contribution Contribution::expanded(std::string source, double expanded_u, double k, double sensitivity) {
  return make(std::move(source), expanded_u, Distribution::normal, k, sensitivity, infinite_dof);
}
Contribution Contribution::standard(std::string source, double standard_u, double sensitivity) {
  return make(std::move(source), standard_u, Distribution::normal, 1.0, sensitivity, infinite_dof);
}
Contribution Contribution::rectangular(std::string source, double half_width, double sensitivity) {
  return make(std::move(source), half_width, Distribution::rectangular, standard_divisor(Distribution::rectangular),
              sensitivity, infinite_dof);
}
Contribution Contribution::triangular(std::string source, double half_width, double sensitivity) {
  return make(std::move(source), half_width, Distribution::triangular, standard_divisor(Distribution::triangular),
              sensitivity, infinite_dof);
}
Contribution Contribution::rounding(std::string source, double scale_interval, double sensitivity) {
  return make(std::move(source), scale_interval, Distribution::rounding, standard_divisor(Distribution::rounding),
              sensitivity, infinite_dof);
}

double welch_satterthwaite(const std::vector<BudgetLine>& lines, double combined) {
  if (!(combined > 0.0)) return infinite_dof;
  double denominator = 0.0;
  for (const auto& l : lines) {
    if (std::isinf(l.input.dof) || l.contribution == 0.0) continue;
    // (u_i / u_c)^4 / nu_i, scaled to avoid underflow of fourth powers of small masses.
    const double r = l.contribution / combined;
    denominator += r * r * r * r / l.input.dof;
  }
  if (denominator == 0.0) return infinite_dof;
  return 1.0 / denominator;
}

BudgetResult combine(std::string measurand, std::string unit, std::vector<Contribution> inputs,
                     const BudgetOptions& options) {
  BudgetResult r;
  r.measurand = std::move(measurand);
  r.unit = std::move(unit);
  double sum_sq = 0.0;
  for (auto& in : inputs) {
    if (!std::isfinite(in.value) || in.value < 0.0)
      throw InputError(fmt::format("uncertainty source \"{}\": value {} is not a non-negative number.", in.source,
                                   in.value));
    if (!std::isfinite(in.divisor) || in.divisor <= 0.0)
      throw InputError(fmt::format("uncertainty source \"{}\": divisor {} is not positive.", in.source, in.divisor));
    if (!std::isfinite(in.sensitivity))
      throw InputError(fmt::format("uncertainty source \"{}\": sensitivity coefficient is not finite.", in.source));
    if (!(in.dof > 0.0))
      throw InputError(fmt::format("uncertainty source \"{}\": degrees of freedom {} is not positive.", in.source,
                                   in.dof));
    BudgetLine line;
    line.standard_uncertainty = in.standard_uncertainty();
    line.contribution = in.contribution();
    line.input = std::move(in);
    sum_sq += line.contribution * line.contribution;
    r.lines.push_back(std::move(line));
  }
  r.combined = std::sqrt(sum_sq);
  for (auto& l : r.lines) l.share = sum_sq > 0.0 ? l.contribution * l.contribution / sum_sq : 0.0;
  r.nu_eff = welch_satterthwaite(r.lines, r.combined);
  r.coverage_probability = options.coverage_probability;
  if (options.fixed_k) {
    if (!(*options.fixed_k > 0.0))
      throw InputError(fmt::format("coverage factor: {} is not positive.", *options.fixed_k));
    r.k = *options.fixed_k;
    r.k_fixed = true;
    r.dof_used = r.nu_eff;
  } else {
    r.dof_used = r.nu_eff;
    if (options.truncate_dof && std::isfinite(r.nu_eff)) r.dof_used = std::max(1.0, std::floor(r.nu_eff));
    r.k = coverage_factor(r.dof_used, options.coverage_probability);
  }
  r.expanded = r.k * r.combined;
  return r;
}

std::string BudgetResult::statement(int significant) const {
  const auto num = [&](double v) { return fmt::format("{:.{}g}", v, significant); };
  const double pct = 100.0 * coverage_probability;
  const std::string dof_text =
      std::isinf(nu_eff) ? std::string("effective degrees of freedom infinite")
                         : fmt::format("effective degrees of freedom {:.1f}", nu_eff);
  return fmt::format("expanded uncertainty U = {} {} = k u_c with u_c = {} {}, k = {:.2f}{}, coverage probability "
                     "about {:.0f} % ({})",
                     num(expanded), unit, num(combined), unit, k, k_fixed ? " (fixed)" : "", pct, dof_text);
}

}  // namespace plumb::stats
