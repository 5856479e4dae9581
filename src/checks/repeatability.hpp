#pragma once
// The weekly balance check: n replicate weighings of one reference weight give accuracy (bias against
// the weight's conventional mass), precision (repeatability SD), the USP <41> minimum weight, and a
// plain statement of whether the balance's last digit is backed by its repeatability.
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "checks/verdict.hpp"
#include "core/units.hpp"

namespace plumb::checks {

struct BalanceUnderTest {
  ExactMass capacity;
  ExactMass readability;                  ///< d, the scale interval shown
  std::optional<ExactMass> smallest_net;  ///< smallest net weight the lab weighs on it
};

struct ReferenceWeightUse {
  std::string id;
  ExactMass conventional_mass;  ///< nominal + certificate correction
  Mass expanded_uncertainty;    ///< U from the weight's certificate
  double coverage_factor = 2.0; ///< k of that certificate
};

struct RepeatabilityInput {
  BalanceUnderTest balance;
  ReferenceWeightUse weight;
  std::vector<ExactMass> readings;  ///< exact, as displayed
  TolerancePolicy policy;
};

struct RepeatabilityResult {
  long long n = 0;
  Mass mean, sd, reference, bias;
  double bias_pct = 0.0;
  Mass readability;
  double sd_over_d = 0.0;
  Mass sd_used;         ///< max(s, 0.41 d), the USP <41> value
  Mass min_weight;      ///< 2000 * sd_used
  bool digit_backed = true;
  Mass effective_resolution;  ///< the step the data support (= d when backed)
  std::string readability_statement;
  std::optional<Mass> bias_limit;
  std::optional<Mass> sd_limit;
  bool weight_suitable = true;
  std::vector<Criterion> criteria;
  Verdict verdict = Verdict::pass;
  std::vector<std::string> reasons;  ///< every fail names its reason; empty on pass
  std::vector<std::string> notes;    ///< observations that do not change the verdict
};

/// Minimum number of replicate weighings accepted, and the number USP <41> and common practice ask for.
inline constexpr std::size_t min_readings = 2;
inline constexpr std::size_t recommended_readings = 10;

/// Evaluates a repeatability-and-accuracy check. Pure: no I/O. Throws InputError on fewer than
/// min_readings readings or a reading finer than the balance's readability.
RepeatabilityResult evaluate_repeatability(const RepeatabilityInput& in);

/// The smallest step of the 1-2-5 series at or above `s`: the resolution a repeatability s supports.
Mass resolution_supported_by(Mass s);

}  // namespace plumb::checks
