#include "report/runs/text.hpp"

#include <fmt/format.h>

#include "checks/procedure.hpp"
#include "report/calibration/text.hpp"
#include "report/format/text.hpp"
#include "report/pipette/text.hpp"
#include "report/weekly_check/text.hpp"

namespace plumb::report {

namespace {

/// Where the run stands (void, superseded, a correction), the same for every procedure.
std::string standing_lines(const nlohmann::json& r) {
  std::string out;
  const auto add = [&](const std::string& text) {
    for (const auto& l : wrap(text, 78, "  ", "    ")) out += l + "\n";
  };
  if (r.contains("void") && r["void"].is_object())
    add(fmt::format("VOID since {} (by {}): {}. Kept for history; it does not count for due dates, trends or "
                    "summaries.",
                    r["void"].value("at", ""), r["void"].value("by", ""), r["void"].value("reason", "")));
  if (r.contains("superseded_by") && r["superseded_by"].is_number_integer())
    add(fmt::format("SUPERSEDED by run {}: this record was corrected and is kept for history only.",
                    r["superseded_by"].get<std::int64_t>()));
  if (r.contains("supersedes") && r["supersedes"].is_number_integer())
    add(fmt::format("corrects run {}: {}", r["supersedes"].get<std::int64_t>(),
                    r.value("correction_reason", std::string())));
  return out;
}

std::string procedure_text(const nlohmann::json& run) {
  switch (checks::parse_procedure(run.value("procedure", ""), "procedure")) {
    case checks::Procedure::repeatability: return repeatability_run_text(run);
    case checks::Procedure::calibration: return calibration_run_text(run);
    case checks::Procedure::gravimetric: return pipette_run_text(run);
  }
  return {};
}

}  // namespace

std::string run_text(const nlohmann::json& run) {
  std::string text = procedure_text(run);
  const auto first_line_end = text.find('\n');
  if (first_line_end == std::string::npos) return text + standing_lines(run);
  return text.insert(first_line_end + 1, standing_lines(run));
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
