#pragma once
// Review of an instrument's check interval from its history, by two of the methods of OIML D 10:2007 /
// ILAC G24 ("Guidelines for the determination of calibration intervals of measuring instruments"):
//
// Method 1, automatic adjustment ("staircase"): after each check the interval is lengthened when the
// instrument was found in tolerance and shortened when it was not. D 10 leaves the step sizes to the
// laboratory; plumb's defaults lengthen by 25 % and halve. Why asymmetric: a result out of tolerance puts
// every result since the previous check in doubt, so the interval is cut hard; one result in tolerance is
// weak evidence, so the interval grows gently (common practice). Limits of 7 to 730 days keep it sane.
//
// Control-chart method: the individuals chart (Western Electric rules) says whether the result is
// stable, and the drift projection (stats/drift.hpp) says when it may leave its tolerance; the next
// check must fall before that date.
#include <span>
#include <string>
#include <vector>

#include "core/dates.hpp"
#include "stats/observation.hpp"

namespace plumb::stats {

struct CheckOutcome {
  Date date;
  bool in_tolerance = true;  ///< the verdict recorded for that check
};

struct IntervalSteps {
  double lengthen = 1.25;  ///< factor after a result in tolerance
  double shorten = 0.5;    ///< factor after a result out of tolerance (or an unstable/drifting result)
  int min_days = 7;
  int max_days = 730;
};

enum class IntervalAction { lengthen, keep, shorten };
std::string_view to_string(IntervalAction a);

struct IntervalRecommendation {
  IntervalAction action = IntervalAction::keep;
  std::string method;
  int current_days = 0;
  int recommended_days = 0;
  std::vector<std::string> reasoning;  ///< sentences, in the order the decision was made
  [[nodiscard]] Interval recommended() const { return {recommended_days, Interval::Unit::day}; }
};

/// The caution added to every recommendation.
extern const char* const interval_review_caution;

/// OIML D 10 method 1 on the latest outcome. Throws InputError when `outcomes` is empty, out of date
/// order, or the steps are not 0 < shorten < 1 < lengthen with 1 <= min_days <= max_days.
IntervalRecommendation staircase_review(Interval current, std::span<const CheckOutcome> outcomes,
                                        const IntervalSteps& steps = {});

struct ControlChartReviewOptions {
  ToleranceLimits tolerance;
  IntervalSteps steps;
  std::size_t recent_checks = 10;  ///< flags touching these last checks count as "unstable now"
  std::string unit;
};

/// The control-chart method. Decision, in order: latest result out of tolerance -> shorten; a Western
/// Electric flag among the recent checks -> shorten; a projected date of reaching a limit sooner than
/// the current interval after the last check -> shorten to end before it; sooner than the lengthened
/// interval -> keep; else lengthen, but never past the projection horizon. Too few results -> keep.
IntervalRecommendation control_chart_review(Interval current, std::span<const Observation> history,
                                            const ControlChartReviewOptions& options);

}  // namespace plumb::stats
