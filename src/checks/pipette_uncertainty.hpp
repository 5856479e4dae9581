#pragma once
// The uncertainty budget of a gravimetric pipette check (ISO 8655-6 method, GUM JCGM 100:2008): for each
// volume and channel, the mean volume V = Z (m + e) carries
//   repeatability of the mean   s_r / sqrt(n)                 Type A, n - 1 dof
//   balance calibration         Z u(m)                        u of a weighing from the balance's calibration
//                                                             (checks/balance_weighing_u.hpp), rounding included
//   balance readability         Z d / (2 sqrt 3)              the fallback without a calibration, or beside a
//                                                             u of a weighing that leaves the rounding out
//   water temperature           m dZ/dt u(t)                  dZ/dt through water and air density
//   air density                 m dZ/drho_a u(rho_a)
//   evaporation                 Z e / sqrt 3                  the entered correction e, known to within itself
//   Z factor (water density)    m dZ/drho_w u(rho_w)          the water density formula's own uncertainty
// The systematic error e_s = V - V_s has the same u (V_s is the selected volume, exact). The random error s_r
// has u(s_r) = s_r / sqrt(2 (n - 1)) (GUM E.4.3). U = k u with k = 2 (coverage probability about 95 %).
#include <optional>

#include "core/units.hpp"
#include "metrology/gravimetric.hpp"
#include "stats/uncertainty_budget.hpp"

namespace plumb::checks {

inline constexpr double pipette_coverage_k = 2.0;
/// ISO 8655-6:2002 asks for a thermometer with a maximum error of 0.2 degC: read as a rectangular
/// half-width, u(t) = 0.2 / sqrt(3) degC when the lab enters none. (The requirement is recalled from memory of the
/// standard; doc/uncertainty.md says so and how a lab enters its own u.)
inline constexpr double default_thermometer_half_width_c = 0.2;
/// u(rho_a) when the lab enters none: 0.01 kg/m3, under 1 % of air density, which covers the OIML R 111-1
/// (2004) E.3 approximation with an ordinary barometer and hygrometer. Its share of a budget is negligible.
inline constexpr double default_air_density_u_kg_m3 = 0.01;
/// The water density formula of Tanaka et al., Metrologia 38 (2001) 301: U = 0.00084 kg/m3 (k = 2), recalled from
/// memory of the paper; its share of any budget is below 0.1 %.
inline constexpr double water_density_formula_u_kg_m3 = 0.00042;

struct PipetteUncertaintyOptions {
  std::optional<double> water_temperature_u_c;  ///< standard u of the thermometer; default from the half-width
  std::optional<double> air_density_u_kg_m3;    ///< standard u of rho_a; default above
};

struct PipetteMeanInputs {
  Mass mean_mass;       ///< mean of (m_i + e)
  Volume random_error;  ///< s_r of the volumes
  long long n = 0;
  Volume selected;                ///< V_s
  Mass readability;               ///< d
  std::optional<Mass> balance_u;  ///< standard u of a weighing from the balance's calibration
  std::string balance_u_basis;    ///< where balance_u came from, for the budget row
  /// balance_u is a calibration's u(E), which holds the rounding of d at zero and load (EURAMET cg-18): no
  /// separate readability row then.
  bool balance_u_includes_rounding = false;
  std::string no_balance_u_reason;  ///< without balance_u: why, for the readability row (the fallback)
  std::optional<Mass> evaporation;
  gravimetric::Environment environment;
  gravimetric::ZFactor z;
};

struct PipetteUncertainty {
  stats::BudgetResult budget;  ///< of the mean volume (= of e_s), in uL
  Volume systematic_expanded;
  double systematic_expanded_pct = 0.0;  ///< of V_s
  Volume random_expanded;
  double cv_expanded_pct = 0.0;  ///< U of the CV, in percentage points
  double k = pipette_coverage_k;
};

/// dZ/dt in uL/mg per degC at the run's conditions, water and air at one temperature (central difference of the
/// formulas of metrology/density.hpp over +-0.01 degC).
double z_temperature_slope(const gravimetric::Environment& env);

/// Throws InputError when an entered u is negative or not finite, or n < 2.
PipetteUncertainty pipette_uncertainty(const PipetteMeanInputs& in, const PipetteUncertaintyOptions& options);

}  // namespace plumb::checks
