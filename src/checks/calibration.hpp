#pragma once
// A full balance calibration (EURAMET cg-18 v4.0): repeatability, eccentricity and error of indication,
// combined into the uncertainty of the error E at each load, a tolerance by policy, and a statement of
// conformity per load under the balance's decision rule (ILAC G8:09/2019). As-found and, after an
// adjustment, as-left sets are evaluated alike.
//
// Uncertainty budget of E = I - m_ref at a load L (cg-18 7.1 and 7.2; each a row of the budget):
//   rounding at zero        d / (2 sqrt 3)                         rounding,     c = +1
//   rounding at load        d / (2 sqrt 3)                         rounding,     c = +1
//   repeatability           s / sqrt(n_L), s from the repeatability series whose load is nearest L,
//                           n_L the number of up readings averaged at L; dof = n_series - 1 (Type A)
//   eccentricity            |Delta_I_ecc|max / (2 L_ecc) * L, rectangular (/ sqrt 3)        c = +1
//   reference weights       sum of u(m_c,i) = U_i / k_i, or class MPE_i / sqrt 3 when only the class is
//                           known; summed linearly (the weights' calibrations are taken as fully
//                           correlated, cg-18 7.1.2.1), normal                                c = -1
//   air buoyancy            u(delta_m_B) from metrology/buoyancy.hpp, summed over the weights   c = -1
//   weight drift            sum of D_i, rectangular (/ sqrt 3)                                 c = -1
// u_c by root sum of squares, nu_eff by Welch-Satterthwaite, k from Student's t at 95.45 %, U = k u_c.
#include <optional>
#include <string>
#include <vector>

#include "checks/decision_rule.hpp"
#include "checks/eccentricity.hpp"
#include "checks/linearity.hpp"
#include "metrology/accuracy_classes.hpp"
#include "metrology/air_density_cipm.hpp"
#include "stats/uncertainty_budget.hpp"

namespace plumb::checks {

struct CalibratedBalance {
  std::string id;
  ExactMass capacity;
  ExactMass readability;                          ///< d
  std::optional<ExactMass> verification_interval; ///< e (OIML R 76); d when absent
  std::optional<r76::AccuracyClass> accuracy_class;
};

/// Which tolerance each load's error is judged against.
struct CalibrationTolerance {
  enum class Kind { oiml_r76, usp41, lab };
  Kind kind = Kind::oiml_r76;
  r76::Verification verification = r76::Verification::in_service;  ///< OIML R 76: MPE in service (2x) or initial
  std::optional<ExactMass> lab_limit;  ///< lab: +/- absolute limit
  std::optional<double> lab_percent;   ///< lab: +/- percent of the load; with both, the larger applies
  [[nodiscard]] std::string name() const;
};

struct RepeatabilitySeries {
  ExactMass load;                   ///< test load (nominal or conventional mass)
  std::vector<ExactMass> readings;  ///< exact, as displayed
};
inline constexpr std::size_t min_repeatability_readings = 5;

/// One set of measurements: as found, or as left after an adjustment.
struct CalibrationSet {
  std::vector<RepeatabilitySeries> repeatability;     ///< at least one series (as left: may inherit as found)
  std::optional<EccentricityInput> eccentricity;      ///< as left: may inherit as found
  std::vector<LoadPoint> loads;
};

struct CalibrationInput {
  CalibratedBalance balance;
  std::vector<CalibrationWeight> weights;
  std::optional<density::Environment> environment;  ///< nullopt: air density not measured
  density::AirFormula air_formula = density::AirFormula::cipm2007;
  bool apply_buoyancy_correction = true;
  stats::Model model = stats::Model::line;
  CalibrationTolerance tolerance;
  DecisionRule rule = DecisionRule::simple_acceptance;
  stats::BudgetOptions budget_options;
  CalibrationSet as_found;
  std::optional<CalibrationSet> as_left;
};

struct RepeatabilitySummary {
  ExactMass load;
  long long n = 0;
  Mass mean;
  Mass sd;
};

struct LoadCalibration {
  LoadResult load;                  ///< reference, indication, E, hysteresis, residual
  stats::BudgetResult budget;       ///< of E, in grams (stats works on plain numbers; its unit is "g")
  Mass tolerance;                   ///< +/- limit on E
  std::string tolerance_basis;      ///< e.g. "OIML R 76 class II, e = 0.01 g, in service: 1 e x 2"
  Decision decision;
  Mass weight_uncertainty;               ///< sum of certificate U (or class MPE) of the weights used
  bool weight_suitable = true;           ///< weight_uncertainty <= tolerance / 3
  std::size_t repeatability_series = 0;  ///< 1-based index of the series whose s was used
};

struct CalibrationSetResult {
  std::vector<RepeatabilitySummary> repeatability;
  std::optional<EccentricityResult> eccentricity;
  LinearityResult linearity;
  std::vector<LoadCalibration> loads;
  Conformity overall = Conformity::pass;  ///< the worst state over the loads
  bool weights_suitable = true;
  std::vector<std::string> notes;
};

struct CalibrationResult {
  std::optional<density::AirDensity> air;
  DecisionRule rule = DecisionRule::simple_acceptance;
  std::string rule_statement;
  std::string tolerance_name;
  CalibrationSetResult as_found;
  std::optional<CalibrationSetResult> as_left;
  std::vector<std::string> notes;
};

/// Evaluates the calibration. Pure: no I/O. Throws InputError (naming the field) on bad input, e.g. a
/// repeatability series with fewer than 5 readings, no repeatability series, environment out of range,
/// or any error evaluate_linearity() / evaluate_eccentricity() raise.
CalibrationResult evaluate_calibration(const CalibrationInput& in);

/// The tolerance (+/- limit) for a load, with a sentence saying where it comes from.
std::pair<Mass, std::string> tolerance_for(const CalibrationTolerance& t, const CalibratedBalance& b,
                                           const LoadResult& load);

/// Orders conformity states from best to worst (pass < pass, not proven < fail, not proven < fail).
Conformity worst(Conformity a, Conformity b);

}  // namespace plumb::checks
