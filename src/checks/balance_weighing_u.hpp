#pragma once
// The standard uncertainty of one weighing on a balance, from the balance's latest calibration (EURAMET cg-18):
// the calibration certificate states the expanded uncertainty U(E) of the error of indication, with its k, at
// each calibrated load; a weighing of mass m takes u = U(E) / k at m. Between two calibrated loads u is
// interpolated linearly; at or below the smallest it is that load's u (u(E) grows with the load, so this bounds
// it from above); above the largest it is scaled in proportion to the load (plumb's stated, conservative
// extrapolation). u(E) already holds the rounding of the indication at zero and at load (cg-18), so a budget
// that uses it does not add a separate readability term.
#include <cstdint>
#include <string>
#include <vector>

#include "core/dates.hpp"
#include "core/units.hpp"

namespace plumb::checks {

struct CalibratedLoad {
  Mass load;      ///< reference mass of the calibrated load
  Mass expanded;  ///< U(E) at that load
  double k = 2.0;
};

/// The balance calibration a budget draws on, as recorded.
struct BalanceCalibrationUse {
  std::string balance_id;
  std::int64_t run_id = 0;
  Date performed_on;
  std::string certificate;            ///< its certificate number; empty when none was issued
  std::vector<CalibratedLoad> loads;  ///< of the final stage (as left after an adjustment); at least one
};

struct WeighingUncertainty {
  Mass u;             ///< standard uncertainty of a weighing at the load
  std::string basis;  ///< the calibration, the loads used and how, for the budget row
};

/// Throws InputError when the calibration has no loads or a load's U or k is not positive.
WeighingUncertainty weighing_uncertainty_at(const BalanceCalibrationUse& cal, Mass load);

}  // namespace plumb::checks
