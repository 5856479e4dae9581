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

std::string run_text_dated_today(const nlohmann::json& run) {
  std::string text = run_text(run);
  // Every procedure's heading reads "Run N: ... on DATE by ...": mark the date in that first line only.
  const std::string on = " on " + run.value("date", "") + " ";
  if (const auto at = text.find(on); at != std::string::npos && at < text.find('\n'))
    text.insert(at + on.size() - 1, " (today)");
  return text;
}

}  // namespace plumb::report
