#include "report/calibration/certificate_text.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "core/units.hpp"
#include "report/calibration/text.hpp"
#include "report/format/text.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

}  // namespace

std::string calibration_certificate_text(const json& c, const std::string& content_sha256) {
  std::string out;
  const auto add = [&](const std::string& l) { out += l + "\n"; };
  const auto para = [&](const std::string& text, const std::string& first, const std::string& indent) {
    for (const auto& l : wrap(text, 78, first, indent)) add(l);
  };
  const json& lab = c["lab"];
  const json& inst = c["instrument"];
  const json& cal = c["calibration"];
  const json& run = c["check"];
  add(rule('='));
  add(field_text(lab, "name"));
  for (const auto& l : lab.value("address_lines", json::array())) add(l.get<std::string>());
  if (!field_text(lab, "accreditation", "").empty()) para(field_text(lab, "accreditation"), "", "");
  add(rule('='));
  add(fmt::format("{:<52}{:>26}", upper_case(field_text(c, "title")), "No. " + field_text(c, "number")));
  add(fmt::format("Issued {} by {}", field_text(c, "issued_at"), field_text(c, "issued_by")));
  add(rule());
  add(fmt::format("{:<14}{} (balance), {}", "Instrument", field_text(inst, "id"), field_text(inst, "location")));
  if (const auto id = identity_text(inst); !id.empty()) add(fmt::format("{:<14}{}", "", id));
  add(fmt::format("{:<14}capacity {}, readability d = {}", "", grams_field(inst, "capacity_g"),
                  grams_field(inst, "readability_g")));
  add(fmt::format("{:<14}run {}, performed {} by {}", "Calibration", field_text(run, "run_id"), field_text(run, "date"),
                  field_text(run, "operator")));
  para(field_text(cal, "procedure"), fmt::format("{:<14}", "Procedure"), std::string(14, ' '));
  para(field_text(cal["settings"], "description"), fmt::format("{:<14}", "Settings"), std::string(14, ' '));
  para(field_text(cal, "tolerance"), fmt::format("{:<14}", "Tolerance"), std::string(14, ' '));
  add("");
  add("Environment");
  const json& env = cal["environment"];
  if (env.value("measured", false))
    add(fmt::format("  temperature {} degC, pressure {} hPa, relative humidity {} %", field_text(env, "temperature_c"),
                    field_text(env, "pressure_hpa"), field_text(env, "humidity_pct")));
  para(field_text(env, "statement"), "  ", "  ");
  add("");
  add("Reference weights (traceability)");
  for (const auto& w : c["weights"]) {
    add(fmt::format("  {:<8} nominal {}, class {}, conventional mass {}, density {} kg/m3{}", field_text(w, "id"),
                    field_text(w, "nominal"), field_text(w, "class"), grams_field(w, "conventional_mass_g"),
                    field_text(w, "density_kg_m3"), w.value("density_assumed", false) ? " (assumed)" : ""));
    add(fmt::format("  {:<8} U = {} (k = {}); certificate {}, calibrated {}, due {}", "",
                    grams_field(w, "uncertainty_g"), field_text(w, "k"), field_text(w, "certificate"),
                    field_text(w, "calibrated_on"), field_text(w, "due_on")));
    add(fmt::format("  {:<8} drift allowance {}: {}", "", w["drift_g"].is_string() ? grams_field(w, "drift_g") : "0",
                    field_text(w, "drift_basis")));
  }
  const std::string d = field_text(cal, "readability_g", "");
  const json& results = c["check"];
  for (const auto& stage : cal["stages"]) {
    add("");
    add(rule());
    add(fmt::format("{}: {}", upper_case(field_text(stage, "title")), field_text(stage, "state")));
    const json& set = field_text(stage, "stage") == "as-left" ? results["as_left"] : results["as_found"];
    for (const auto& l : calibration_set_lines(set, d, {field_text(stage, "stage") == field_text(cal, "final_stage")}))
      add(l);
  }
  add(rule());
  add("Uncertainty");
  para(field_text(c, "uncertainty_statement"), "  ", "  ");
  add("Decision rule");
  para(field_text(cal["decision_rule"], "statement"), "  ", "  ");
  for (const auto& m : cal["decision_rule"]["state_meanings"]) para(m.get<std::string>(), "  - ", "    ");
  add("");
  if (cal.value("adjusted", false))
    add(fmt::format("The balance was adjusted: as found {}, as left {}.", field_text(cal["stages"][0], "state"),
                    field_text(cal["stages"][1], "state")));
  else
    add(fmt::format("No adjustment was made: as found {}.", field_text(cal["stages"][0], "state")));
  for (const auto& n : cal.value("notes", json::array())) para(n.get<std::string>(), "Note: ", "  ");
  if (field_text(c, "verdict") == "pass")
    add(fmt::format("RESULT: PASS ({} {})    Next calibration due: {}", field_text(cal, "final_stage"),
                    field_text(cal, "final_state"), field_text(c, "next_due")));
  else
    add(fmt::format("RESULT: FAIL ({} {})    The balance is OUT OF SERVICE until a passing calibration.",
                    field_text(cal, "final_stage"), field_text(cal, "final_state")));
  out += certificate_closing_text(c, content_sha256);
  return out;
}

}  // namespace plumb::report
