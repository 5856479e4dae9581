#include "report/calibration_certificate_text.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "core/units.hpp"
#include "report/calibration_text.hpp"
#include "report/text_format.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

std::string str(const json& j, const char* key, const std::string& fallback = "-") {
  if (!j.is_object() || !j.contains(key) || j[key].is_null()) return fallback;
  return j[key].is_string() ? j[key].get<std::string>() : j[key].dump();
}

std::string grams_text(const json& j, const char* key) {
  if (!j.contains(key) || !j[key].is_string()) return "-";
  return ExactMass::grams(Decimal::parse(j[key].get<std::string>())).to_string();
}

std::string upper(std::string s) {
  std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return static_cast<char>(std::toupper(c)); });
  return s;
}

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
  add(str(lab, "name"));
  for (const auto& l : lab.value("address_lines", json::array())) add(l.get<std::string>());
  if (!str(lab, "accreditation", "").empty()) para(str(lab, "accreditation"), "", "");
  add(rule('='));
  add(fmt::format("{:<52}{:>26}", upper(str(c, "title")), "No. " + str(c, "number")));
  add(fmt::format("Issued {} by {}", str(c, "issued_at"), str(c, "issued_by")));
  add(rule());
  add(fmt::format("{:<14}{} (balance), {}", "Instrument", str(inst, "id"), str(inst, "location")));
  add(fmt::format("{:<14}capacity {}, readability d = {}", "", grams_text(inst, "capacity_g"),
                  grams_text(inst, "readability_g")));
  add(fmt::format("{:<14}run {}, performed {} by {}", "Calibration", str(run, "run_id"), str(run, "date"),
                  str(run, "operator")));
  para(str(cal, "procedure"), fmt::format("{:<14}", "Procedure"), std::string(14, ' '));
  para(str(cal["settings"], "description"), fmt::format("{:<14}", "Settings"), std::string(14, ' '));
  para(str(cal, "tolerance"), fmt::format("{:<14}", "Tolerance"), std::string(14, ' '));
  add("");
  add("Environment");
  const json& env = cal["environment"];
  if (env.value("measured", false))
    add(fmt::format("  temperature {} degC, pressure {} hPa, relative humidity {} %", str(env, "temperature_c"),
                    str(env, "pressure_hpa"), str(env, "humidity_pct")));
  para(str(env, "statement"), "  ", "  ");
  add("");
  add("Reference weights (traceability)");
  for (const auto& w : c["weights"]) {
    add(fmt::format("  {:<8} nominal {}, class {}, conventional mass {}, density {} kg/m3{}", str(w, "id"),
                    str(w, "nominal"), str(w, "class"), grams_text(w, "conventional_mass_g"), str(w, "density_kg_m3"),
                    w.value("density_assumed", false) ? " (assumed)" : ""));
    add(fmt::format("  {:<8} U = {} (k = {}); certificate {}, calibrated {}, due {}", "",
                    grams_text(w, "uncertainty_g"), str(w, "k"), str(w, "certificate"), str(w, "calibrated_on"),
                    str(w, "due_on")));
    add(fmt::format("  {:<8} drift allowance {}: {}", "", w["drift_g"].is_string() ? grams_text(w, "drift_g") : "0",
                    str(w, "drift_basis")));
  }
  const std::string d = str(cal, "readability_g", "");
  const json& results = c["check"];
  for (const auto& stage : cal["stages"]) {
    add("");
    add(rule());
    add(fmt::format("{}: {}", upper(str(stage, "title")), str(stage, "state")));
    const json& set = str(stage, "stage") == "as-left" ? results["as_left"] : results["as_found"];
    for (const auto& l : calibration_set_lines(set, d, {str(stage, "stage") == str(cal, "final_stage")})) add(l);
  }
  add(rule());
  add("Uncertainty");
  para(str(c, "uncertainty_statement"), "  ", "  ");
  add("Decision rule");
  para(str(cal["decision_rule"], "statement"), "  ", "  ");
  for (const auto& m : cal["decision_rule"]["state_meanings"]) para(m.get<std::string>(), "  - ", "    ");
  add("");
  if (cal.value("adjusted", false))
    add(fmt::format("The balance was adjusted: as found {}, as left {}.", str(cal["stages"][0], "state"),
                    str(cal["stages"][1], "state")));
  else
    add(fmt::format("No adjustment was made: as found {}.", str(cal["stages"][0], "state")));
  for (const auto& n : cal.value("notes", json::array())) para(n.get<std::string>(), "Note: ", "  ");
  if (str(c, "verdict") == "pass")
    add(fmt::format("RESULT: PASS ({} {})    Next calibration due: {}", str(cal, "final_stage"),
                    str(cal, "final_state"), str(c, "next_due")));
  else
    add(fmt::format("RESULT: FAIL ({} {})    The balance is OUT OF SERVICE until a passing calibration.",
                    str(cal, "final_stage"), str(cal, "final_state")));
  add("");
  add("Signatures");
  for (const auto& s : c.value("signatories", json::array())) {
    const std::string name = str(s, "name", "");
    add(fmt::format("  {:<14} {:<24} signature ____________________  date __________", str(s, "role") + ":",
                    name.empty() ? "________________________" : name));
  }
  add("");
  para(str(c, "caution"), "Caution: ", "  ");
  add(rule());
  add(fmt::format("Certificate content SHA-256: {}", content_sha256));
  return out;
}

}  // namespace plumb::report
