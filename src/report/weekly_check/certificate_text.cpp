#include "report/weekly_check/certificate_text.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "core/units.hpp"
#include "report/format/text.hpp"
#include "report/weekly_check/uncertainty_text.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

}  // namespace

std::string balance_check_certificate_text(const json& c, const std::string& content_sha256) {
  std::string out;
  const json& lab = c["lab"];
  const json& inst = c["instrument"];
  const json& run = c["check"];
  add_line(out, rule('='));
  add_line(out, field_text(lab, "name"));
  for (const auto& l : lab.value("address_lines", json::array())) add_line(out, l.get<std::string>());
  if (!field_text(lab, "accreditation", "").empty())
    for (const auto& l : wrap(field_text(lab, "accreditation"), 78)) add_line(out, l);
  add_line(out, rule('='));
  std::string title = field_text(c, "title");
  std::transform(title.begin(), title.end(), title.begin(), ::toupper);
  add_line(out, fmt::format("{:<52}{:>26}", title, "No. " + field_text(c, "number")));
  add_line(out, fmt::format("Issued {} by {}", field_text(c, "issued_at"), field_text(c, "issued_by")));
  add_line(out, rule());

  add_line(out, fmt::format("{:<14}{} ({}), {}", "Instrument", field_text(inst, "id"), field_text(inst, "kind"),
                       field_text(inst, "location")));
  if (const auto id = identity_text(inst); !id.empty()) add_line(out, fmt::format("{:<14}{}", "", id));
  add_line(out,
      fmt::format("{:<14}capacity {}, readability d = {}, smallest net weight {}", "", grams_field(inst, "capacity_g"),
                  grams_field(inst, "readability_g"), grams_field(inst, "smallest_net_g")));
  add_line(out, fmt::format("{:<14}check interval {}", "", field_text(inst, "check_every")));
  add_line(out, fmt::format("{:<14}run {}, {}, performed {} by {}", "Check", field_text(run, "run_id"),
                       field_text(run, "procedure"), field_text(run, "date"), field_text(run, "operator")));
  add_line(out, fmt::format("{:<14}{}", "Policy", field_text(run, "policy_name")));
  add_line(out, "");
  add_line(out, "Reference weights (traceability)");
  for (const auto& w : c["weights"]) {
    add_line(out, fmt::format("  {:<8} nominal {}, class {}, conventional mass {}", field_text(w, "id"),
                         field_text(w, "nominal"), field_text(w, "class"), grams_field(w, "conventional_mass_g")));
    add_line(out, fmt::format("  {:<8} U = {} (k = {}); certificate {}, calibrated {}, due {}", "",
                         grams_field(w, "uncertainty_g"), field_text(w, "k"), field_text(w, "certificate"),
                         field_text(w, "calibrated_on"), field_text(w, "due_on")));
  }
  add_line(out, "");
  const json& readings = run["readings"];
  add_line(out, fmt::format("Readings as displayed ({})", readings.empty() ? "" : field_text(readings[0], "unit")));
  std::string line;
  for (std::size_t i = 0; i < readings.size(); ++i) {
    line += fmt::format("{:>4} {:<11}", field_text(readings[i], "seq"), field_text(readings[i], "text"));
    if (i % 5 == 4 || i + 1 == readings.size()) {
      add_line(out, line);
      line.clear();
    }
  }
  add_line(out, "");
  add_line(out, "Results");
  add_line(out, fmt::format("  {:<38}{}", "number of readings n", field_text(run, "n")));
  // Which minimum applied and why; certificates of runs recorded before it was stored go without.
  if (run.contains("required_readings"))
    for (const auto& l :
         wrap(fmt::format("{}: {}", field_text(run, "required_readings"), field_text(run, "readings_basis")), 78,
              fmt::format("  {:<38}", "minimum number of readings"), std::string(40, ' ')))
      add_line(out, l);
  const int decimals = inst.contains("readability_g") && inst["readability_g"].is_string()
                           ? Decimal::parse(inst["readability_g"].get<std::string>()).significant_scale() + 2
                           : 6;
  std::string conventional = "-";
  if (!c["weights"].empty()) conventional = grams_field(c["weights"][0], "conventional_mass_g");
  add_line(out, fmt::format("  {:<38}{}", "mean indication", fixed_grams_field(run, "mean_g", decimals)));
  add_line(out, fmt::format("  {:<38}{}", "reference value (conventional mass)", conventional));
  add_line(out, fmt::format("  {:<38}{}  ({:+.5f} %)", "bias (accuracy)", grams_field(run, "bias_g"),
                       run.value("bias_pct", 0.0)));
  if (const std::string u = weekly_expanded_u_text(run, "bias_expanded_u_g"); !u.empty())
    add_line(out, fmt::format("  {:<38}{}", "uncertainty of the bias", u));
  add_line(out, fmt::format("  {:<38}{}", "repeatability SD s (n - 1)", grams_field(run, "sd_g")));
  if (const std::string u = weekly_expanded_u_text(run, "sd_expanded_u_g"); !u.empty())
    add_line(out, fmt::format("  {:<38}{}", "uncertainty of s", u));
  add_line(out, fmt::format("  {:<38}{:.2f}", "s / d", run.value("sd_over_d", 0.0)));
  add_line(out, fmt::format("  {:<38}{}  = 2000 x max(s, 0.41 d)", "minimum weight (USP <41>)",
                       grams_field(run, "min_weight_g")));
  for (const auto& l : wrap(field_text(run, "readability_statement"), 78, "  Readability: ", "    ")) add_line(out, l);
  if (run.contains("bias_expanded_u_g"))
    for (const auto& l : wrap(weekly_uncertainty_model_text(), 78, "  ", "  ")) add_line(out, l);
  add_line(out, "");
  add_line(out, fmt::format("Tolerances ({})", field_text(run, "policy_name")));
  for (const auto& cr : run.value("criteria", json::array())) {
    add_line(out,
        fmt::format("  {:<14} {} = {} against limit {}: {}", field_text(cr, "name"), field_text(cr, "quantity"),
                    mass_text(cr["measured_g"]), mass_text(cr["limit_g"]), cr.value("pass", false) ? "pass" : "FAIL"));
    add_line(out, fmt::format("  {:<14} limit basis: {}", "", field_text(cr, "basis")));
  }
  add_line(out, fmt::format("Decision rule: {}", field_text(c, "decision_rule")));
  add_line(out, "");
  std::string verdict = field_text(c, "verdict");
  std::transform(verdict.begin(), verdict.end(), verdict.begin(), ::toupper);
  if (field_text(c, "verdict") == "pass")
    add_line(out, fmt::format("VERDICT: {}    Next check due: {}", verdict, field_text(c, "next_due")));
  else
    add_line(out, fmt::format("VERDICT: {}    The instrument is OUT OF SERVICE until a passing check.", verdict));
  out += reasons_and_notes_text(run);
  out += certificate_closing_text(c, content_sha256);
  return out;
}

}  // namespace plumb::report
