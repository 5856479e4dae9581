#pragma once
// Error of indication of a balance (EURAMET cg-18 v4.0, 5.4; OIML R 76-1 A.4.4): test loads built from
// combinations of reference weights ("W100+W50+W20"), each read once or more going up and optionally
// coming down (hysteresis). E = I - m_ref at each load, with m_ref the conventional mass of the
// combination plus, when the air density is known, its buoyancy correction (metrology/buoyancy.hpp).
// A model of reading against reference is fitted with stats::fit: a straight line, a line through the
// origin (a pure sensitivity error) or a quadratic (a linearity error). The error at any load inside the
// calibrated range follows from it; outside the range it is refused or marked as extrapolated.
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/units.hpp"
#include "metrology/weight_classes.hpp"
#include "stats/regression.hpp"

namespace plumb::checks {

/// A reference weight as its certificate (or only its class) describes it.
struct CalibrationWeight {
  std::string id;                                  ///< e.g. "W100"
  ExactMass nominal;
  std::optional<ExactMass> conventional_mass;      ///< nominal + certificate correction; nominal when absent
  std::optional<ExactMass> expanded_uncertainty;   ///< U of the certificate (with coverage_factor)
  double coverage_factor = 2.0;
  std::optional<weights::WeightClass> weight_class;  ///< used alone when no certificate U is given: MPE / sqrt 3
  double density_kg_m3 = 8000.0;
  double u_density_kg_m3 = 0.0;                    ///< standard uncertainty of the density
  std::optional<ExactMass> drift;                  ///< D: largest change expected since its calibration
  std::string certificate;                         ///< traceability: certificate number and issuer
  std::string density_source;  ///< where rho and u(rho) came from, for the budget row (empty: not stated)
  std::string drift_source;    ///< where D came from, or why there is none

  [[nodiscard]] ExactMass reference_mass() const { return conventional_mass.value_or(nominal); }
  /// u(m_c): U / k from the certificate, else the class MPE / sqrt 3. Throws InputError if neither is known.
  [[nodiscard]] Mass standard_uncertainty() const;
  /// True when only the class is known (no certificate uncertainty).
  [[nodiscard]] bool class_only() const { return !expanded_uncertainty.has_value(); }
};

/// Splits "W100+W50+W20" into ids. Throws InputError naming `field` on an empty id.
std::vector<std::string> parse_combination(std::string_view text, std::string_view field = "load");

struct LoadPoint {
  std::string combination;      ///< "W100+W50"
  std::vector<ExactMass> up;    ///< readings going up (>= 1), exact, as displayed
  std::vector<ExactMass> down;  ///< readings coming down (optional: hysteresis)
};

/// The air during the test, when known (kg/m3).
struct AirDensityUse {
  double rho_a = 1.2;
  double u_rho_a = 0.0;
  bool apply_correction = true;  ///< add delta_m_B to m_ref; otherwise only its uncertainty is used
};

struct LinearityInput {
  ExactMass capacity;
  ExactMass readability;  ///< d
  std::vector<CalibrationWeight> weights;
  std::vector<LoadPoint> loads;
  stats::Model model = stats::Model::line;
  std::optional<AirDensityUse> air;  ///< nullopt: air not measured (rho_a = 1.2 +/- 0.12 rectangular)
};

inline constexpr std::size_t min_loads = 5;
inline constexpr std::size_t recommended_max_loads = 11;

struct LoadResult {
  std::size_t index = 0;  ///< 1-based, as in the input
  std::string combination;
  std::vector<std::string> weight_ids;
  ExactMass nominal;                  ///< sum of nominal values
  ExactMass conventional;             ///< sum of conventional masses, exact
  Mass buoyancy_correction;           ///< delta_m_B added to m_ref (0 when not applied)
  Mass u_buoyancy;                    ///< standard uncertainty of delta_m_B (summed over the weights)
  Mass reference;                     ///< m_ref = conventional + correction
  std::vector<ExactMass> up, down;
  Mass indication;                       ///< mean of the up readings
  Mass error;                            ///< E = I - m_ref
  std::optional<ExactMass> error_exact;  ///< E exactly, when one up reading and no buoyancy correction
  std::optional<Mass> indication_down;
  std::optional<Mass> hysteresis;     ///< mean down - mean up
  Mass u_weights;                     ///< sum of u(m_c) of the weights (fully correlated, cg-18 7.1.2.1)
  Mass u_drift;                       ///< sum of D / sqrt 3
  bool class_only = false;            ///< some weight is known only by its class
  Mass residual;                      ///< of the fitted model
};

struct LinearityResult {
  std::vector<LoadResult> loads;
  stats::Fit fit;                     ///< reading against reference, both in grams (stats works on plain numbers)
  std::string equation;               ///< e.g. "I = 1.0000012 m - 0.0001"
  std::string error_equation;         ///< the same model as E = I - m
  Mass max_abs_error;
  std::size_t max_error_load = 0;     ///< 1-based index
  std::optional<Mass> max_abs_hysteresis;
  std::vector<std::string> notes;
};

/// Evaluates the loads. Throws InputError for fewer than 5 loads, a load above capacity, an unknown
/// weight or one named twice in a combination, a reading finer than d, a load without up readings,
/// or a quadratic with fewer than 3 distinct loads.
LinearityResult evaluate_linearity(const LinearityInput& in);

enum class Extrapolation { refuse, mark };
struct InterpolatedError {
  Mass load;
  Mass indication;  ///< fitted reading at the load
  Mass error;       ///< fitted reading - load
  Mass se;          ///< standard error of the fitted mean at the load
  bool extrapolated = false;
};
/// The fitted error at `load`. Outside [smallest, largest] calibrated load: InputError (refuse) or
/// a result marked extrapolated (mark).
InterpolatedError error_at(const LinearityResult& r, Mass load, Extrapolation policy = Extrapolation::refuse);

}  // namespace plumb::checks
