#include "report/runs/text.hpp"

#include "checks/procedure.hpp"
#include "report/calibration/text.hpp"
#include "report/pipette/text.hpp"
#include "report/weekly_check/text.hpp"

namespace plumb::report {

std::string run_text(const nlohmann::json& run) {
  switch (checks::parse_procedure(run.value("procedure", ""), "procedure")) {
    case checks::Procedure::repeatability: return repeatability_run_text(run);
    case checks::Procedure::calibration: return calibration_run_text(run);
    case checks::Procedure::gravimetric: return pipette_run_text(run);
  }
  return {};
}

}  // namespace plumb::report
