#pragma once
// Which certificate of a reference weight a check or calibration on a given date is traced to. One rule for
// every procedure: a weekly check (record_check) and a full calibration (record_calibration) must never pick
// different certificates for the same weight and date.
#include <vector>

#include "core/dates.hpp"
#include "store/records.hpp"

namespace plumb::app {

/// The certificate in force on `on`: the latest one dated on or before it, the later entry when two carry the
/// same date. `history` is the weight's certificates oldest first (by date, then entry order), as
/// store::weight_calibrations_until returns them. Null when no certificate is dated on or before `on`.
const store::WeightCalibration* certificate_in_force(const std::vector<store::WeightCalibration>& history, Date on);

/// Whether the certificate's due date had passed on `on`: an overdue weight cannot give a traceable result
/// (common practice).
bool overdue_on(const store::WeightCalibration& certificate, Date on);

}  // namespace plumb::app
