#pragma once
// Drift of a check result over time: a least-squares line of the result against days since the first
// check (stats::fit, the same code checked against NIST StRD), its prediction interval, and the date
// on which the result is projected to reach a tolerance limit.
//
// What reaches the limit (the criterion) is, by default, the prediction bound of the trend: the value a
// new check result stays inside with the stated confidence if the trend goes on. We chose it over
// "trend + U" because it already holds the scatter of past results about the line (which contains their
// measurement uncertainty, so adding U would count that twice) and the uncertainty of the line itself,
// which widens the further one projects: an honest projection grows less certain with distance.
// "Trend + latest U" (ILAC G8 guard band w = U on the fitted value) is offered as the alternative.
//
// Within the observed span a reached date is interpolation; after the last check it is extrapolation and
// always marked as such. plumb refuses to project further past the last check than the length of the
// observed history (horizon factor 1): a line fitted over T days carries no evidence of how the
// instrument behaves beyond about T days more.
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "stats/observation.hpp"
#include "stats/regression.hpp"

namespace plumb::stats {

enum class DriftCriterion { prediction_bound, trend_plus_uncertainty };
enum class Extent { interpolation, extrapolation };
std::string_view to_string(Extent e);

struct DriftOptions {
  ToleranceLimits tolerance;
  double confidence = 0.95;  ///< two-sided level of the prediction interval
  DriftCriterion criterion = DriftCriterion::prediction_bound;
  double horizon_factor = 1.0;  ///< projection allowed up to horizon_factor * span past the last check
  std::string unit;             ///< for the sentences, e.g. "mg"
  std::string quantity = "result";
};

enum class DriftStatus {
  not_enough_data,             ///< fewer than 3 results or all on one day: no line, see message
  no_tolerance,                ///< line fitted; no limit to project against
  reaches_limit,               ///< the criterion reaches a limit on or before the horizon
  not_reached_within_horizon,  ///< it does not; plumb refuses to look further
};

struct LimitReached {
  bool upper = true;     ///< which limit
  double limit = 0.0;
  Date date;
  int day = 0;           ///< days since the first check
  Extent extent = Extent::interpolation;
};

struct DriftResult {
  DriftStatus status = DriftStatus::not_enough_data;
  std::string message;             ///< why nothing was fitted (not_enough_data)
  std::optional<Fit> fit;          ///< result against days since `origin`
  Date origin;                     ///< date of the first check (day 0)
  Date last;                       ///< date of the last check
  int span_days = 0;
  double t_quantile = 0.0;         ///< Student t at (1 + confidence) / 2 with the fit's dof
  double slope_per_day = 0.0;
  double slope_p_value = 1.0;      ///< two-sided test of zero slope
  bool slope_significant = false;  ///< p < 0.05: only then is a trend line worth drawing
  double uncertainty_used = 0.0;   ///< the latest U (trend_plus_uncertainty only)
  Date horizon;                    ///< no projection after this date
  std::optional<LimitReached> reached;        ///< by the chosen criterion
  std::optional<LimitReached> trend_reaches;  ///< by the fitted line alone, for comparison
  std::vector<std::string> explanation;       ///< the reasoning, as sentences

  /// Fitted value and two-sided prediction interval at `day` (days since origin).
  struct Band {
    double fitted, lower, upper;
  };
  [[nodiscard]] Band band(double day) const;
  /// "y = 0.011 d + 1.02" with d in days since origin.
  [[nodiscard]] std::string equation(int digits = 4) const;
};

/// Fits and projects. Pure. Throws InputError on non-finite values, negative U, dates out of order, a
/// confidence outside (0, 1), a horizon factor < 0, or a lower limit above the upper.
DriftResult analyse_drift(std::span<const Observation> history, const DriftOptions& options = {});

}  // namespace plumb::stats
