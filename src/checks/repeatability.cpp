#include "checks/repeatability.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "checks/repeatability_uncertainty.hpp"
#include "core/errors.hpp"
#include "metrology/usp41.hpp"
#include "stats/exact_summary.hpp"

namespace plumb::checks {

Mass resolution_supported_by(Mass s) {
  if (s.g() <= 0) return s;
  const double decade = std::pow(10.0, std::floor(std::log10(s.g())));
  for (double step : {1.0, 2.0, 5.0, 10.0}) {
    // A tiny tolerance keeps an s that is exactly a step (0.2 mg) on that step.
    if (step * decade >= s.g() * (1 - 1e-12)) return Mass::grams(step * decade);
  }
  return Mass::grams(10 * decade);
}

std::size_t required_readings(const TolerancePolicy& policy) {
  return std::max(static_cast<std::size_t>(std::max(policy.required_readings(), 0)), min_readings_for_sd);
}

void require_enough_readings(std::size_t n, const TolerancePolicy& policy, std::string_view where) {
  if (n < required_readings(policy))
    throw InputError(fmt::format("{}: {} reading(s) given; {}.", where, n, policy.readings_basis()));
}

bool met_its_minimum(long long n, std::optional<long long> required) {
  const long long floor = static_cast<long long>(min_readings_for_sd);
  return n >= std::max(required.value_or(usp41::min_replicate_weighings), floor);
}

RepeatabilityResult evaluate_repeatability(const RepeatabilityInput& in) {
  require_enough_readings(in.readings.size(), in.policy, "readings");
  const Decimal d_exact = in.balance.readability.in_grams();
  const int d_scale = d_exact.significant_scale();
  const std::vector<Decimal> readings_g = in_grams(in.readings);
  for (std::size_t i = 0; i < readings_g.size(); ++i) {
    if (readings_g[i].significant_scale() > d_scale)
      throw InputError(fmt::format("reading {} ({} g) has more decimals than the readability {} allows.", i + 1,
                                   readings_g[i].to_string(), in.balance.readability.to_string()));
  }

  const stats::ExactSummary sum = stats::summarize_exact(readings_g);
  RepeatabilityResult r;
  r.n = sum.n;
  r.required_readings = static_cast<int>(required_readings(in.policy));
  r.readings_basis = in.policy.readings_basis();
  r.mean = Mass::grams(sum.mean());
  r.sd = Mass::grams(sum.sd());
  r.reference = in.weight.conventional_mass.approx();
  r.bias = Mass::grams(sum.mean_minus(in.weight.conventional_mass.in_grams()));
  r.bias_pct = 100.0 * r.bias.g() / r.reference.g();
  const RepeatabilityUncertainty u = repeatability_uncertainty(
      {r.sd, r.n, in.balance.readability.approx(), in.weight.expanded_uncertainty, in.weight.coverage_factor});
  r.bias_expanded_u = u.bias_expanded;
  r.sd_expanded_u = u.sd_expanded;
  r.uncertainty_k = u.k;
  r.readability = in.balance.readability.approx();
  r.sd_over_d = r.sd / r.readability;
  r.sd_used = usp41::effective_sd(r.sd, r.readability);
  r.min_weight = usp41::minimum_weight(r.sd, r.readability);

  r.digit_backed = r.sd <= r.readability;
  r.effective_resolution = r.digit_backed ? r.readability : resolution_supported_by(r.sd);
  r.readability_statement =
      r.digit_backed
          ? fmt::format("The last displayed digit (d = {}) is backed by the repeatability (s = {}, s/d = {:.2f}).",
                        format_mass(r.readability), format_mass(r.sd), r.sd_over_d)
          : fmt::format("The last displayed digit (d = {}) is not backed by the repeatability (s = {}, s/d = {:.2f}); "
                        "the data support a resolution of about {}.",
                        format_mass(r.readability), format_mass(r.sd), r.sd_over_d,
                        format_mass(r.effective_resolution));

  const Mass weight_u = in.weight.expanded_uncertainty;
  const auto fail = [&](std::string why) {
    r.verdict = Verdict::fail;
    r.reasons.push_back(std::move(why));
  };

  if (r.n < static_cast<long long>(recommended_readings))
    r.notes.push_back(fmt::format("Only {} readings; {} or more are recommended for a repeatability SD.", r.n,
                                  recommended_readings));
  const double load_fraction =
      in.weight.nominal.value_or(in.weight.conventional_mass).approx() / in.balance.capacity.approx();
  if (load_fraction < usp41::test_load_min_fraction || load_fraction > 1.0)
    r.notes.push_back(fmt::format("The test load is {:.1f} % of capacity; USP <41> asks for 5 % to 100 %.",
                                  100.0 * load_fraction));

  if (in.policy.kind == TolerancePolicy::Kind::usp41) {
    r.bias_limit = usp41::accuracy_limit(r.reference);
    if (!in.balance.smallest_net) {
      fail("no smallest net weight is declared for this balance, so USP <41> repeatability cannot be judged");
    } else {
      const Mass m = in.balance.smallest_net->approx();
      r.criteria.push_back({"repeatability", "minimum weight", r.min_weight, m,
                            "declared smallest net weight (USP <41>)", r.min_weight <= m});
    }
    if (in.balance.smallest_net && r.min_weight > in.balance.smallest_net->approx()) {
      fail(fmt::format("repeatability: minimum weight {} exceeds the declared smallest net weight {} (USP <41>)",
                       format_mass(r.min_weight), in.balance.smallest_net->to_string()));
    }
  } else {
    if (in.policy.max_bias) r.bias_limit = in.policy.max_bias->approx();
    if (in.policy.max_sd) r.sd_limit = in.policy.max_sd->approx();
    if (r.sd_limit)
      r.criteria.push_back({"repeatability", "SD s", r.sd, *r.sd_limit, "lab limit", r.sd <= *r.sd_limit});
    if (r.sd_limit && r.sd > *r.sd_limit)
      fail(fmt::format("repeatability: s = {} exceeds the lab limit {}", format_mass(r.sd),
                       in.policy.max_sd->to_string()));
  }
  if (r.bias_limit) {
    const Mass abs_bias = abs(r.bias);
    r.criteria.push_back({"accuracy", "|bias|", abs_bias, *r.bias_limit,
                          in.policy.kind == TolerancePolicy::Kind::usp41 ? "0.10 % of the reference value (USP <41>)"
                                                                         : "lab limit",
                          abs_bias <= *r.bias_limit});
    if (abs_bias > *r.bias_limit)
      fail(fmt::format("accuracy: |bias| = {} exceeds the limit {} ({})", format_mass(abs_bias),
                       format_mass(*r.bias_limit), in.policy.name()));
    // The weight must be good enough to show conformity: U <= limit / 3 (USP <41>; common practice).
    if (weight_u > *r.bias_limit / 3.0) {
      r.weight_suitable = false;
      fail(fmt::format("reference weight {} is unsuitable for this check: its uncertainty U = {} exceeds a third "
                       "of the accuracy limit ({})",
                       in.weight.id, format_mass(weight_u), format_mass(*r.bias_limit / 3.0)));
    }
  }
  return r;
}

}  // namespace plumb::checks
