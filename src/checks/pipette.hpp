#pragma once
// The gravimetric check of a piston pipette (ISO 8655-6): replicate weighings of dispensed water at each
// test volume and channel become volumes V_i = (m_i + evaporation) * Z; their mean gives the systematic
// error, their standard deviation the random error; both are judged against the pipette's limits
// (ISO 8655-2 or the lab's own, metrology/pipette_limits.hpp).
//
// Statistics are exact where they can be: the weighings (plus evaporation) are summed exactly as decimals in
// mg, their mean and SD rounded once, and only then multiplied by Z. CV = 100 s / mean does not depend on Z.
//
// Test volumes (ISO 8655-6): a fixed-volume pipette is tested at its nominal volume; a variable one at its
// nominal volume, 50 % of it, and 10 % of it or the lower limit of its range, whichever is greater.
// A run must cover every channel at every test volume it reports; a run that leaves out a default test
// volume or a channel is evaluated but cannot pass (the overall verdict fails, naming what is missing).
//
// Pure: no I/O, no clock. Throws InputError (exit status 2, nothing written) on bad input.
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "checks/balance_weighing_u.hpp"
#include "checks/pipette_uncertainty.hpp"
#include "checks/verdict.hpp"
#include "core/dates.hpp"
#include "core/decimal.hpp"
#include "core/units.hpp"
#include "metrology/gravimetric.hpp"
#include "metrology/pipette_balance_requirements.hpp"
#include "metrology/pipette_limits.hpp"

namespace plumb::checks {

enum class PipetteKind { fixed, variable };
std::string_view to_string(PipetteKind k);

/// A pipette as registered. The check interval and other bookkeeping belong to the store.
struct PipetteDefinition {
  std::string id;
  PipetteKind kind = PipetteKind::fixed;
  ExactVolume nominal;                     ///< the fixed volume, or the largest selectable volume
  std::optional<ExactVolume> lower_limit;  ///< variable: the smallest selectable volume (range = [lower, nominal])
  int channels = 1;
  pipette_limits::LimitsPolicy limits;
};

/// Largest channel count accepted (a 384-channel head is the largest in common use).
inline constexpr int max_channels = 384;

/// Throws InputError when the definition is inconsistent: nominal volume not positive, a variable pipette
/// without a lower limit below its nominal volume, a fixed pipette with a lower limit other than its
/// nominal, a channel count outside 1..max_channels, or limits that cannot apply (validate_policy).
void validate(const PipetteDefinition& pipette);

/// The ISO 8655-6 test volumes, largest first: {nominal} or {nominal, 50 %, max(10 %, lower limit)}.
std::vector<ExactVolume> default_test_volumes(const PipetteDefinition& pipette);

/// The weighings of one channel at one test volume, exactly as the balance displayed them.
struct ChannelWeighings {
  int channel = 1;  ///< 1-based
  std::vector<MassReading> weighings;
};

struct TestVolumeWeighings {
  ExactVolume volume;  ///< the selected volume
  std::vector<ChannelWeighings> channels;
};

struct PipetteRunInput {
  PipetteDefinition pipette;
  pipette_balance::BalanceForPipette balance;
  std::optional<Date> run_date;  ///< when given, the balance must be in date on it
  gravimetric::Environment environment;
  std::optional<ExactMass> evaporation_per_weighing;  ///< added to every weighing
  std::vector<TestVolumeWeighings> volumes;
  PipetteUncertaintyOptions uncertainty;  ///< entered instrument uncertainties; stated defaults otherwise
  /// The balance's latest calibration: the u of each channel's weighing at its mean mass comes from it.
  std::optional<BalanceCalibrationUse> balance_calibration;
  std::string no_balance_calibration;  ///< without one: why, for the budget row
};

inline constexpr std::size_t min_replicates = 4;
inline constexpr std::size_t recommended_replicates = 10;

struct ChannelResult {
  ExactVolume selected;
  int channel = 1;
  long long n = 0;
  Mass mean_mass;                ///< mean of (m_i + evaporation), exact then rounded once
  Mass sd_mass;                  ///< its sample SD (n - 1)
  std::vector<Volume> volumes;   ///< each V_i = (m_i + evaporation) * Z, for a certificate's table
  Volume mean;                   ///< mean volume = Z * mean_mass
  Volume systematic_error;       ///< mean - selected
  double systematic_error_pct = 0.0;  ///< 100 * systematic_error / selected
  Volume random_error;           ///< sample SD of the volumes = Z * sd_mass
  double cv_pct = 0.0;           ///< 100 * random_error / mean
  PipetteUncertainty uncertainty;  ///< budget of the mean volume; U of e_s and s_r (checks/pipette_uncertainty.hpp)
  pipette_limits::AppliedLimits limits;
  Verdict verdict = Verdict::pass;
  std::vector<std::string> reasons;  ///< every fail names its reason; empty on pass
};

struct TestVolumeResult {
  ExactVolume selected;
  pipette_balance::Suitability balance;  ///< always suitable here: an unsuitable balance refuses the run
  std::vector<ChannelResult> channels;   ///< ascending by channel
  Verdict verdict = Verdict::pass;       ///< fail if any channel fails
};

struct PipetteRunResult {
  std::string pipette_id;
  gravimetric::ZFactor z;
  std::optional<ExactMass> evaporation_per_weighing;
  std::vector<TestVolumeResult> volumes;  ///< descending by volume
  bool complete = true;                   ///< every default test volume and every channel was tested
  Verdict verdict = Verdict::pass;
  std::vector<std::string> reasons;  ///< every fail, named by volume and channel, and what is missing
  std::vector<std::string> notes;    ///< observations that do not change the verdict
};

/// Evaluates a gravimetric pipette check. Throws InputError (one clear sentence) on: an invalid pipette
/// definition; water temperature outside 15-30 degC (or implausible pressure or humidity); no test volumes;
/// a test volume outside the pipette's range or given twice; a channel number outside 1..channels or given
/// twice; fewer than min_replicates weighings; a weighing that is not positive or has more decimals than the
/// balance's readability; a negative evaporation loss; a balance out of service, out of date on run_date, or
/// unsuitable for a test volume under ISO 8655-6 Table 1.
PipetteRunResult evaluate_pipette_run(const PipetteRunInput& in);

}  // namespace plumb::checks
