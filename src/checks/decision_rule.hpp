#pragma once
// Decision rules and statements of conformity, ILAC G8:09/2019.
// - Simple acceptance (guard band w = 0): a result inside the tolerance limits passes, outside fails;
//   a result exactly on a limit passes. The risk of a false accept can reach 50 % near a limit.
// - Guard band w = U (the expanded uncertainty of the result): a result passes only when its whole
//   interval [E - U, E + U] lies inside the limits, and fails only when the whole interval lies outside.
//   A result whose interval straddles a limit is neither a clear pass nor a clear fail; plumb names
//   these two states "pass, not proven" (the result is inside the limit, but within U of it) and
//   "fail, not proven" (outside the limit, but within U of it).
#include <optional>
#include <string>
#include <string_view>

#include "core/units.hpp"

namespace plumb::checks {

enum class DecisionRule { simple_acceptance, guard_band_u };
std::string_view to_string(DecisionRule r);  ///< "simple acceptance", "guard band w = U"
std::string_view key(DecisionRule r);        ///< "simple", "guard-band"
/// Parses "simple" / "simple acceptance" / "guard-band" / "guard band" / "w=U". Throws InputError.
DecisionRule parse_decision_rule(std::string_view text, std::string_view field = "decision rule");
/// One sentence for the certificate, naming ILAC G8:09/2019.
std::string rule_statement(DecisionRule r);

enum class Conformity { pass, pass_not_proven, fail_not_proven, fail };
std::string_view to_string(Conformity c);  ///< "pass", "pass, not proven", "fail, not proven", "fail"
std::string_view key(Conformity c);        ///< "pass", "pass-not-proven", "fail-not-proven", "fail"
/// True only for a clear pass.
inline bool clear_pass(Conformity c) {
  return c == Conformity::pass;
}

/// Tolerance limits on the measured mass (the error of indication of a balance); either side may be open.
struct Limits {
  std::optional<Mass> lower;
  std::optional<Mass> upper;
  static Limits symmetric(Mass tolerance) { return {-tolerance, tolerance}; }
};

struct Decision {
  DecisionRule rule = DecisionRule::simple_acceptance;
  Conformity state = Conformity::pass;
  Mass value;
  Mass expanded_uncertainty;
  Mass guard_band;                       ///< w: 0 or U
  std::optional<Mass> acceptance_lower;  ///< lower + w
  std::optional<Mass> acceptance_upper;  ///< upper - w
  bool acceptance_zone_empty = false;    ///< 2U >= the tolerance width: no result can clearly pass
  std::string explanation;               ///< one plain sentence for the certificate
};

/// Decides conformity of `value` with expanded uncertainty `U` against `limits`. Throws InputError when
/// U is negative or not finite, both limits are missing, or lower > upper.
Decision decide(Mass value, Mass U, const Limits& limits, DecisionRule rule);

/// Simple acceptance on a magnitude computed in binary floating point (a pipette error, a CV): a value equal
/// to its limit is not beyond it. "Equal" allows a relative 1e-9, since a limit printed as a short decimal
/// (0.8 uL) and an error computed through the Z factor never meet to the last bit.
bool beyond_limit(double magnitude, double limit);

}  // namespace plumb::checks
