#include "report/pipette/certificate_text.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "core/units.hpp"
#include "report/pipette/text.hpp"
#include "report/format/text.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

}  // namespace

std::string pipette_certificate_text(const json& c, const std::string& content_sha256) {
  std::string out;
  const json& lab = c["lab"];
  const json& inst = c["instrument"];
  const json& run = c["check"];
  const json bal = c.value("balance_used", json::object());
  const json env = run.value("environment", json::object());
  const json z = run.value("z", json::object());
  add_line(out, rule('='));
  add_line(out, field_text(lab, "name"));
  for (const auto& l : lab.value("address_lines", json::array())) add_line(out, l.get<std::string>());
  if (!field_text(lab, "accreditation", "").empty())
    for (const auto& l : wrap(field_text(lab, "accreditation"), 78)) add_line(out, l);
  add_line(out, rule('='));
  add_line(out, fmt::format("{:<52}{:>26}", upper_case(field_text(c, "title")), "No. " + field_text(c, "number")));
  add_line(out, fmt::format("Issued {} by {}", field_text(c, "issued_at"), field_text(c, "issued_by")));
  add_line(out, rule());

  const std::string volume =
      field_text(inst, "volume_kind") == "variable"
          ? fmt::format("variable volume {}-{} uL", field_text(inst, "lower_limit_ul"), field_text(inst, "nominal_ul"))
          : fmt::format("fixed volume {} uL", field_text(inst, "nominal_ul"));
  add_line(out,
      fmt::format("{:<14}{} (piston pipette), {}", "Instrument", field_text(inst, "id"), field_text(inst, "location")));
  if (const auto id = identity_text(inst); !id.empty()) add_line(out, fmt::format("{:<14}{}", "", id));
  add_line(out, fmt::format("{:<14}{}, {} channel(s), check interval {}", "", volume, field_text(inst, "channels"),
                       field_text(inst, "check_every")));
  add_line(out, fmt::format("{:<14}run {}, gravimetric method (ISO 8655-6)", "Check", field_text(run, "run_id")));
  add_line(out, fmt::format("{:<14}performed {} by {}", "", field_text(run, "date"), field_text(run, "operator")));
  add_line(out, fmt::format("{:<14}{}", "Limits", field_text(inst, "limits")));
  add_line(out, fmt::format("{:<14}source: {}", "", field_text(inst, "limits_source")));
  add_line(out, "");
  add_line(out, "Balance used (traceability)");
  add_line(out, fmt::format("  {} ({}), readability d = {}, capacity {}", field_text(bal, "id"), field_text(bal, "location"),
                       grams_field(bal, "readability_g"), grams_field(bal, "capacity_g")));
  add_line(out, fmt::format("  in service and in date: {} check run {} on {}: {},", field_text(bal, "check_procedure"),
                       field_text(bal, "check_run"), field_text(bal, "checked_on"), field_text(bal, "check_verdict")));
  add_line(out, fmt::format("  next due {}", field_text(bal, "due_on")));
  add_line(out, fmt::format("  balance check certificate: {}", field_text(bal, "check_certificate", "not issued")));
  const json& rb = run.value("balance", json::object());
  const double s_mg = rb.contains("repeatability_g") && rb["repeatability_g"].is_number()
                          ? rb["repeatability_g"].get<double>() * 1e3
                          : 0.0;
  add_line(out, fmt::format("  repeatability s = {:.5f} mg (run {}), suitable per ISO 8655-6 Table 1", s_mg,
                       field_text(rb, "repeatability_run")));
  for (const auto& w : c.value("weights", json::array())) {
    add_line(out, fmt::format("  reference weight {} nominal {}, class {}, conventional mass {}", field_text(w, "id"),
                         field_text(w, "nominal"), field_text(w, "class"), grams_field(w, "conventional_mass_g")));
    add_line(out, fmt::format("    U = {} (k = {}), certificate {} of {}, due {}", grams_field(w, "uncertainty_g"),
                         field_text(w, "k"), field_text(w, "certificate"), field_text(w, "calibrated_on"),
                         field_text(w, "due_on")));
  }
  add_line(out, "");
  add_line(out, "Conditions and conversion factor");
  add_line(out, fmt::format("  water {:g} degC, air pressure {:g} hPa, relative humidity {:g} %",
                       number_field(env, "water_temperature_c"), number_field(env, "air_pressure_hpa"), number_field(env, "humidity_pct")));
  add_line(out, fmt::format("  evaporation: {}", env.contains("evaporation_g") && env["evaporation_g"].is_number()
                                                ? mass_text(env["evaporation_g"]) + " per weighing, added to each"
                                                : "not applied"));
  add_line(out, fmt::format("  Z = {:.7f} uL/mg; V = (m + evaporation) x Z", number_field(z, "z_ul_per_mg")));
  add_line(out, fmt::format("  water {:.5f} kg/m3 (Tanaka et al. 2001)", number_field(z, "water_density_kg_m3")));
  add_line(out, fmt::format("  air {:.5f} kg/m3 (OIML R 111-1 Annex E), weights {:g} kg/m3", number_field(z, "air_density_kg_m3"),
                       number_field(z, "weight_density_kg_m3")));
  add_line(out, "");
  add_line(out, "Results per test volume and channel");
  add_line(out, "  (e_s systematic error, s_r random error as SD, CV = s_r / mean volume)");
  for (const auto& row : pipette_results_table(run)) add_line(out, row);
  add_line(out, "");
  add_line(out, "Limits applied");
  std::vector<std::string> bases;
  for (const auto& tv : run.value("volumes", json::array()))
    for (const auto& ch : tv.value("channels", json::array())) {
      const std::string b = fmt::format("{} uL: {}", field_text(tv, "selected"), field_text(ch["limits"], "basis"));
      if (std::find(bases.begin(), bases.end(), b) == bases.end()) bases.push_back(b);
    }
  for (const auto& b : bases)
    for (const auto& l : wrap(b, 78, "  ", "    ")) add_line(out, l);
  add_line(out, fmt::format("Decision rule: {}", field_text(c, "decision_rule")));
  add_line(out, "");
  add_line(out, "Weighings as displayed (by test volume and channel)");
  std::vector<std::pair<std::string, std::string>> series;
  for (const auto& r : run.value("readings", json::array())) {
    const std::string s = field_text(r, "series");
    auto it = std::find_if(series.begin(), series.end(), [&](const auto& p) { return p.first == s; });
    if (it == series.end()) it = series.insert(series.end(), {s, ""});
    it->second += (it->second.empty() ? "" : " ") + field_text(r, "text") +
                  (field_text(r, "unit") == "g" ? "" : " " + field_text(r, "unit"));
  }
  for (const auto& [name, texts] : series)
    for (const auto& l : wrap(texts, 78, fmt::format("  {:<20}", name + ":"), std::string(22, ' '))) add_line(out, l);
  if (!run.value("readings", json::array()).empty())
    add_line(out, fmt::format("  (unit: {} unless shown)", field_text(run["readings"][0], "unit")));
  add_line(out, "");
  if (field_text(c, "verdict") == "pass")
    add_line(out, fmt::format("VERDICT: PASS    Next check due: {}", field_text(c, "next_due")));
  else
    add_line(out, "VERDICT: FAIL    The pipette is OUT OF SERVICE until a passing check.");
  out += reasons_and_notes_text(run);
  out += certificate_closing_text(c, content_sha256);
  return out;
}

}  // namespace plumb::report
