#include "checks/decision_rule.hpp"

#include <fmt/format.h>

#include <cctype>
#include <cmath>
#include <string>

#include "core/errors.hpp"

namespace plumb::checks {

std::string_view to_string(DecisionRule r) {
  return r == DecisionRule::simple_acceptance ? "simple acceptance" : "guard band w = U";
}
std::string_view key(DecisionRule r) {
  return r == DecisionRule::simple_acceptance ? "simple" : "guard-band";
}

DecisionRule parse_decision_rule(std::string_view text, std::string_view field) {
  std::string t;
  for (char ch : text)
    if (!std::isspace(static_cast<unsigned char>(ch)) && ch != '-' && ch != '_')
      t.push_back(static_cast<char>(std::tolower(static_cast<unsigned char>(ch))));
  if (t == "simple" || t == "simpleacceptance") return DecisionRule::simple_acceptance;
  if (t == "guardband" || t == "w=u" || t == "guardbandw=u") return DecisionRule::guard_band_u;
  throw InputError(fmt::format("{}: \"{}\" is not a decision rule (simple, guard-band).", field, text));
}

std::string rule_statement(DecisionRule r) {
  if (r == DecisionRule::simple_acceptance)
    return "Decision rule: simple acceptance (ILAC G8:09/2019, guard band w = 0): a result inside the tolerance "
           "passes and a result outside fails, without regard to its uncertainty; near a limit the chance of a "
           "wrong decision can reach 50 %.";
  return "Decision rule: guard band w = U (ILAC G8:09/2019): a result passes when it lies inside the tolerance by "
         "at least its expanded uncertainty U (at most about 2.5 % chance of a false pass) and fails when it lies "
         "outside by at least U; a result within U of a limit is stated as \"pass, not proven\" or \"fail, not "
         "proven\": neither a clear pass nor a clear fail.";
}

std::string_view to_string(Conformity c) {
  switch (c) {
    case Conformity::pass:
      return "pass";
    case Conformity::pass_not_proven:
      return "pass, not proven";
    case Conformity::fail_not_proven:
      return "fail, not proven";
    case Conformity::fail:
      return "fail";
  }
  return "?";
}

std::string_view key(Conformity c) {
  switch (c) {
    case Conformity::pass:
      return "pass";
    case Conformity::pass_not_proven:
      return "pass-not-proven";
    case Conformity::fail_not_proven:
      return "fail-not-proven";
    case Conformity::fail:
      return "fail";
  }
  return "?";
}

Decision decide(Mass value, Mass U, const Limits& limits, DecisionRule rule) {
  if (!std::isfinite(value.g())) throw InputError("value: the result to judge is not a finite number.");
  if (!std::isfinite(U.g()) || U < Mass())
    throw InputError(fmt::format("expanded uncertainty: {} is not a non-negative number.", U.g()));
  if (!limits.lower && !limits.upper) throw InputError("tolerance: neither a lower nor an upper limit is given.");
  if (limits.lower && limits.upper && *limits.lower > *limits.upper)
    throw InputError(
        fmt::format("tolerance: lower limit {} is above upper limit {}.", limits.lower->g(), limits.upper->g()));

  Decision d;
  d.rule = rule;
  d.value = value;
  d.expanded_uncertainty = U;
  d.guard_band = rule == DecisionRule::guard_band_u ? U : Mass();
  const Mass w = d.guard_band;
  if (limits.lower) d.acceptance_lower = *limits.lower + w;
  if (limits.upper) d.acceptance_upper = *limits.upper - w;
  d.acceptance_zone_empty = d.acceptance_lower && d.acceptance_upper && *d.acceptance_lower > *d.acceptance_upper;

  const bool inside = (!limits.lower || value >= *limits.lower) && (!limits.upper || value <= *limits.upper);
  if (rule == DecisionRule::simple_acceptance) {
    d.state = inside ? Conformity::pass : Conformity::fail;
    d.explanation = inside ? "The result lies within the tolerance limits (simple acceptance)."
                           : "The result lies outside the tolerance limits (simple acceptance).";
    return d;
  }
  const bool clearly_inside =
      (!limits.lower || value - w >= *limits.lower) && (!limits.upper || value + w <= *limits.upper);
  const bool clearly_outside =
      (limits.lower && value + w < *limits.lower) || (limits.upper && value - w > *limits.upper);
  if (clearly_inside) {
    d.state = Conformity::pass;
    d.explanation = "The result lies inside the tolerance by at least its expanded uncertainty: a clear pass.";
  } else if (clearly_outside) {
    d.state = Conformity::fail;
    d.explanation = "The result lies outside the tolerance by more than its expanded uncertainty: a clear fail.";
  } else if (inside) {
    d.state = Conformity::pass_not_proven;
    d.explanation =
        "The result lies inside the tolerance, but closer to a limit than its expanded uncertainty: "
        "conformity is not proven (neither a clear pass nor a clear fail).";
  } else {
    d.state = Conformity::fail_not_proven;
    d.explanation =
        "The result lies outside the tolerance, but within its expanded uncertainty of the limit: "
        "nonconformity is not proven (neither a clear pass nor a clear fail).";
  }
  if (d.acceptance_zone_empty)
    d.explanation += " The expanded uncertainty is at least half the tolerance width, so no result can clearly pass.";
  return d;
}

bool beyond_limit(double magnitude, double limit) {
  return magnitude > limit * (1.0 + 1e-9);
}

}  // namespace plumb::checks
