#pragma once
// JSON form of a gravimetric pipette check (stored in check_runs.results_json when the run is recorded).
// Volumes are numbers in microlitres (keys end in _ul), relative values in percent (_pct), masses in
// grams (_g); per test volume and channel: mean volume, systematic error, random error (SD), CV, the
// limits applied and their basis, the verdict and every reason for a fail.
#include <nlohmann/json.hpp>

#include "checks/pipette.hpp"

namespace plumb::report {

nlohmann::json to_json(const checks::PipetteRunResult& r);

}  // namespace plumb::report
