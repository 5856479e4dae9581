#pragma once
// The calibration of the balance a pipette check weighed on, as the ISO 8655-6 budget uses it: the latest passing
// calibration run of the balance on or before the check's date that still counts (neither corrected nor void)
// and was not yet due again, with U(E) at each load of its final stage. Without one the budget says why.
#include <optional>
#include <string>

#include "checks/balance_weighing_u.hpp"
#include "core/dates.hpp"
#include "store/database.hpp"

namespace plumb::app {

struct BalanceCalibrationLookup {
  std::optional<checks::BalanceCalibrationUse> calibration;
  std::string absent_reason;  ///< set when `calibration` is empty
};

BalanceCalibrationLookup balance_calibration_on(store::Database& db, const std::string& balance_id, Date on);

}  // namespace plumb::app
