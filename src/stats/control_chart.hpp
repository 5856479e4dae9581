#pragma once
// Individuals (X) control chart of one check result over an instrument's history, with the four
// Western Electric run rules (Western Electric Statistical Quality Control Handbook, 1956).
//
// Sigma is estimated from the baseline's average moving range of consecutive points:
// sigma = MRbar / d2 with d2 = 1.128 for ranges of two (the published constant, 2/sqrt(pi)). The moving
// range sees short-term scatter only, so a slow drift in the baseline does not widen the limits and hide
// itself, which is why it is preferred over the overall SD for individuals charts.
#include <cstddef>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "stats/observation.hpp"

namespace plumb::stats {

/// d2 for moving ranges of two consecutive points.
inline constexpr double d2_moving_range_of_two = 1.128;
/// Default baseline length, a common choice for setting up control limits (common practice).
inline constexpr std::size_t default_baseline_count = 20;

/// The points (by 0-based index into the history) whose scatter sets the limits.
struct Baseline {
  std::size_t first = 0;
  std::size_t count = default_baseline_count;
};

struct ControlLimits {
  std::size_t baseline_first = 0;
  std::size_t baseline_count = 0;
  double centre = 0.0;                ///< mean of the baseline
  double average_moving_range = 0.0;  ///< MRbar of the baseline
  double sigma = 0.0;                 ///< MRbar / 1.128
  [[nodiscard]] double line(int sigmas) const { return centre + sigmas * sigma; }
  [[nodiscard]] double ucl() const { return line(3); }
  [[nodiscard]] double lcl() const { return line(-3); }
};

/// Zone of a point: C within 1 sigma of the centre, B within 2, A within 3, beyond outside the limits.
enum class Zone { c, b, a, beyond };
std::string_view to_string(Zone z);

enum class WesternElectricRule {
  one_beyond_3_sigma = 1,
  two_of_three_beyond_2_sigma = 2,
  four_of_five_beyond_1_sigma = 3,
  eight_on_one_side = 4,
};
/// "Western Electric rule 2: 2 of 3 beyond 2 sigma, same side".
std::string describe(WesternElectricRule r);

enum class Side { above, below };

struct RuleFlag {
  WesternElectricRule rule;
  Side side;
  std::vector<std::size_t> indices;  ///< 0-based points that make up the signal
  std::string explanation;           ///< plain words, naming the checks by date
};

struct ControlChart {
  ControlLimits limits;
  std::vector<Zone> zones;  ///< one per point
  std::vector<RuleFlag> flags;
  std::string method;       ///< how centre and sigma were found, in a sentence
  std::vector<std::string> notes;

  [[nodiscard]] bool in_control() const { return flags.empty(); }
  /// Every point named by any flag, ascending, without repeats.
  [[nodiscard]] std::vector<std::size_t> flagged_indices() const;
};

struct ControlChartOptions {
  /// Absent: the first 20 points (or all of them when there are fewer, with a note).
  std::optional<Baseline> baseline;
  std::string unit;  ///< printed after values in explanations, e.g. "mg"
};

/// Builds the chart and applies the four rules to every point (baseline included). A point exactly on a
/// limit is not beyond it, and a point exactly on the centre line breaks a run of rule 4.
/// Rules 2 and 3 signal at the point that completes the pattern (that point is itself beyond the
/// line), and overlapping signals of one rule and side merge into one flag, so a sustained shift is
/// reported once with all its points; rule 4 reports each maximal run once.
/// Throws InputError for a baseline outside the history, fewer than 2 baseline points, or a baseline
/// whose values are all equal (no moving range, so no limits).
ControlChart individuals_chart(std::span<const Observation> history, const ControlChartOptions& options = {});

}  // namespace plumb::stats
