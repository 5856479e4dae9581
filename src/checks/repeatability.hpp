#pragma once
// The weekly balance check: n replicate weighings of one reference weight give accuracy (bias against
// the weight's conventional mass), precision (repeatability SD), the USP <41> minimum weight, and a
// plain statement of whether the balance's last digit is backed by its repeatability.
#include <optional>
#include <span>
#include <string>
#include <string_view>
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
  /// The weight's nominal mass: the load, which its share of capacity is judged on (the conventional mass when
  /// absent). A full-capacity weight whose correction is positive is still a full-capacity load.
  std::optional<ExactMass> nominal;
};

struct RepeatabilityInput {
  BalanceUnderTest balance;
  ReferenceWeightUse weight;
  std::vector<ExactMass> readings;  ///< exact, as displayed
  TolerancePolicy policy;
};

struct RepeatabilityResult {
  long long n = 0;
  int required_readings = 0;   ///< the minimum the policy asks for (TolerancePolicy::required_readings)
  std::string readings_basis;  ///< where that minimum comes from, as certificates state it
  Mass mean, sd, reference, bias;
  /// U of the bias and of s with their k (checks/repeatability_uncertainty.hpp states the model).
  Mass bias_expanded_u, sd_expanded_u;
  double uncertainty_k = 2.0;
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

/// The fewest readings an SD can be computed from: a lab policy never goes below it (the schema holds lab
/// minimums to 2..100 as well).
inline constexpr std::size_t min_readings_for_sd = 2;
/// Below this a note says the SD rests on few readings (a lab policy may ask for fewer).
inline constexpr std::size_t recommended_readings = 10;

/// The replicate weighings `policy` asks for, never fewer than min_readings_for_sd.
std::size_t required_readings(const TolerancePolicy& policy);
/// Throws InputError "WHERE: N reading(s) given; <basis>." when `n` is below required_readings(policy).
void require_enough_readings(std::size_t n, const TolerancePolicy& policy, std::string_view where);

/// Whether a recorded check of `n` readings met the minimum it was judged by, and so is evidence of the
/// balance's repeatability (ISO 8655-6 Table 1 for a pipette check asks for one). `required` is absent for runs
/// recorded before the minimum was stored with them: both policies asked for 10 then.
bool met_its_minimum(long long n, std::optional<long long> required);

/// Evaluates a repeatability-and-accuracy check. Pure: no I/O. Throws InputError on fewer readings than the
/// policy asks for (require_enough_readings) or a reading finer than the balance's readability.
RepeatabilityResult evaluate_repeatability(const RepeatabilityInput& in);

/// The smallest step of the 1-2-5 series at or above `s`: the resolution a repeatability s supports.
Mass resolution_supported_by(Mass s);

}  // namespace plumb::checks
