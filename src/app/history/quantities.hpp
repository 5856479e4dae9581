#pragma once
// The quantities an instrument's history can be charted by: one number per check run, read from the
// results stored with the run (check_runs.results_json), with its expanded uncertainty and the tolerance
// it is judged against. One table entry per quantity, so a new kind of result (a pipette's systematic
// error, say) is one more entry in history_quantity.cpp and nothing else changes.
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "core/dates.hpp"
#include "stats/observation.hpp"
#include "store/records.hpp"

namespace plumb::app {

/// The coverage factor of every U the history quantities report (about 95 %, normal distribution).
inline constexpr double coverage_k = 2.0;

/// The instrument whose history is read, with what the quantities need to know about it.
struct InstrumentInfo {
  std::string id;
  std::string kind;  ///< "balance", "pipette"
  std::string location;
  Interval every;
  std::string title;  ///< "Balance AB-01 (220 g, d = 0.1 mg)": names the instrument in chart titles
  std::optional<store::BalanceRecord> balance;
};

/// One run as a quantity reads it: the run and the calibration certificate of its first reference weight.
struct RunContext {
  const store::RunRecord& run;
  std::optional<store::WeightCalibration> weight;
};

struct QuantityValue {
  double value = 0.0;
  double expanded_uncertainty = 0.0;  ///< U, k = 2, same unit as value
};

struct QuantityTolerance {
  stats::ToleranceLimits limits;  ///< in the quantity's unit
  std::string basis;              ///< where the limit comes from, as a sentence
};

struct HistoryQuantity {
  std::string key;              ///< what --quantity names: "bias", "sd", "min-weight"
  std::string instrument_kind;  ///< "balance"
  checks::Procedure procedure = checks::Procedure::repeatability;  ///< the runs it is read from
  std::string label;            ///< "Bias at the check load"
  std::string unit;             ///< the unit of values, U and limits: "mg"
  std::string uncertainty_basis;  ///< how U was found, stated under every chart and table
  /// The value of one run, or nothing when the run does not carry it.
  std::function<std::optional<QuantityValue>(const RunContext&)> read;
  /// The axis label, from the latest run: "Bias at 100 g".
  std::function<std::string(const RunContext&)> axis_label;
  /// The limits that apply now: from the latest run and the instrument's record.
  std::function<QuantityTolerance(const RunContext&, const InstrumentInfo&)> tolerance;
  /// For quantities read at one point of a run (a pipette's test volume and channel): the quantity at the
  /// point `selector` names ("10" or "10uL/ch3", the text after '@' in --quantity); empty when there is none.
  std::function<HistoryQuantity(const std::string& selector)> select;
  /// Watched in the HTML report: control chart and drift for each instrument.
  bool watched = false;
  /// For quantities read at one point: the points a run has results at ("10 uL channel 1", ...), named in the
  /// refusal of a point no run has; empty otherwise.
  std::function<std::vector<std::string>(const store::RunRecord&)> points_tested;
  /// A quantity that cannot be negative (an SD, a CV, a minimum weight): its chart axis never goes below zero.
  bool non_negative = false;
  /// The quantity of the check's criterion this charts ("|bias|", "SD s", "minimum weight": checks/repeatability),
  /// so that a failed check's certificate charts the criterion that failed; empty when none.
  std::string criterion = {};
};

/// A pipette's systematic error in uL ("systematic-error") or % ("relative-systematic-error"), or its CV ("cv"), at
/// one test volume (default: the largest of each run) and channel (default: the worst channel of each run).
/// Defined in history_quantity_pipette.cpp.
std::vector<HistoryQuantity> pipette_quantities();

/// Every quantity plumb can chart.
const std::vector<HistoryQuantity>& history_quantities();

/// The quantity `key` (optionally `key@selector`) for this instrument; InputError naming --quantity and the keys
/// that apply otherwise.
HistoryQuantity find_quantity(const std::string& key, const InstrumentInfo& instrument);

/// The keys that apply to an instrument kind, in table order.
std::vector<std::string> quantity_keys(const std::string& instrument_kind);

}  // namespace plumb::app
