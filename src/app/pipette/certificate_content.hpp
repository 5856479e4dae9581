#pragma once
// The parts of a certificate that are particular to a gravimetric pipette check (kind "pipette_check"):
// the pipette as the instrument, the balance used and its traceability (its check run current on the run
// date, that run's certificate if one was issued, and the reference weights of that run with their
// calibration certificates), the source of the limits, and a caution for clinical and pharmaceutical use.
#include <nlohmann/json.hpp>

#include "store/database.hpp"
#include "store/records.hpp"

namespace plumb::app {


/// Completes `content` (assembled by issue_certificate) for a gravimetric run.
void add_pipette_certificate_parts(store::Database& db, const store::RunRecord& run, nlohmann::json& content);

}  // namespace plumb::app
