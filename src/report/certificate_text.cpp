#include "report/certificate_text.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "core/units.hpp"
#include "report/calibration_certificate_text.hpp"
#include "report/pipette_certificate_text.hpp"
#include "report/text_format.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

std::string str(const json& j, const char* key, const std::string& fallback = "-") {
  if (!j.contains(key) || j[key].is_null()) return fallback;
  return j[key].is_string() ? j[key].get<std::string>() : j[key].dump();
}

// Exact decimal gram strings (stored as text) print as they are; numbers go through mass_text.
std::string grams_text(const json& j, const char* key) {
  if (!j.contains(key) || j[key].is_null()) return "-";
  if (j[key].is_string()) return ExactMass::grams(Decimal::parse(j[key].get<std::string>())).to_string();
  return mass_text(j[key], 4);
}

// A computed gram value with the balance's decimals plus two guard digits.
std::string fixed_grams(const json& j, const char* key, int decimals) {
  if (!j.contains(key) || !j[key].is_number()) return "-";
  return fmt::format("{:.{}f} g", j[key].get<double>(), decimals);
}

void add(std::string& out, const std::string& line) { out += line + "\n"; }

}  // namespace

std::string certificate_text(const json& c, const std::string& content_sha256) {
  if (c.value("kind", "") == "balance_calibration") return calibration_certificate_text(c, content_sha256);
  if (c.value("kind", "") == "pipette_check") return pipette_certificate_text(c, content_sha256);
  std::string out;
  const json& lab = c["lab"];
  const json& inst = c["instrument"];
  const json& run = c["check"];
  add(out, rule('='));
  add(out, str(lab, "name"));
  for (const auto& l : lab.value("address_lines", json::array())) add(out, l.get<std::string>());
  if (!str(lab, "accreditation", "").empty())
    for (const auto& l : wrap(str(lab, "accreditation"), 78)) add(out, l);
  add(out, rule('='));
  std::string title = str(c, "title");
  std::transform(title.begin(), title.end(), title.begin(), ::toupper);
  add(out, fmt::format("{:<52}{:>26}", title, "No. " + str(c, "number")));
  add(out, fmt::format("Issued {} by {}", str(c, "issued_at"), str(c, "issued_by")));
  add(out, rule());

  add(out, fmt::format("{:<14}{} ({}), {}", "Instrument", str(inst, "id"), str(inst, "kind"), str(inst, "location")));
  add(out, fmt::format("{:<14}capacity {}, readability d = {}, smallest net weight {}", "", grams_text(inst, "capacity_g"),
                       grams_text(inst, "readability_g"), grams_text(inst, "smallest_net_g")));
  add(out, fmt::format("{:<14}check interval {}", "", str(inst, "check_every")));
  add(out, fmt::format("{:<14}run {}, {}, performed {} by {}", "Check", str(run, "run_id"), str(run, "procedure"),
                       str(run, "date"), str(run, "operator")));
  add(out, fmt::format("{:<14}{}", "Policy", str(run, "policy_name")));
  add(out, "");
  add(out, "Reference weights (traceability)");
  for (const auto& w : c["weights"]) {
    add(out, fmt::format("  {:<8} nominal {}, class {}, conventional mass {}", str(w, "id"), str(w, "nominal"),
                         str(w, "class"), grams_text(w, "conventional_mass_g")));
    add(out, fmt::format("  {:<8} U = {} (k = {}); certificate {}, calibrated {}, due {}", "",
                         grams_text(w, "uncertainty_g"), str(w, "k"), str(w, "certificate"), str(w, "calibrated_on"),
                         str(w, "due_on")));
  }
  add(out, "");
  const json& readings = run["readings"];
  add(out, fmt::format("Readings as displayed ({})", readings.empty() ? "" : str(readings[0], "unit")));
  std::string line;
  for (std::size_t i = 0; i < readings.size(); ++i) {
    line += fmt::format("{:>4} {:<11}", str(readings[i], "seq"), str(readings[i], "text"));
    if (i % 5 == 4 || i + 1 == readings.size()) {
      add(out, line);
      line.clear();
    }
  }
  add(out, "");
  add(out, "Results");
  add(out, fmt::format("  {:<38}{}", "number of readings n", str(run, "n")));
  const int decimals = inst.contains("readability_g") && inst["readability_g"].is_string()
                           ? Decimal::parse(inst["readability_g"].get<std::string>()).significant_scale() + 2
                           : 6;
  std::string conventional = "-";
  if (!c["weights"].empty()) conventional = grams_text(c["weights"][0], "conventional_mass_g");
  add(out, fmt::format("  {:<38}{}", "mean indication", fixed_grams(run, "mean_g", decimals)));
  add(out, fmt::format("  {:<38}{}", "reference value (conventional mass)", conventional));
  add(out, fmt::format("  {:<38}{}  ({:+.5f} %)", "bias (accuracy)", grams_text(run, "bias_g"),
                       run.value("bias_pct", 0.0)));
  add(out, fmt::format("  {:<38}{}", "repeatability SD s (n - 1)", grams_text(run, "sd_g")));
  add(out, fmt::format("  {:<38}{:.2f}", "s / d", run.value("sd_over_d", 0.0)));
  add(out, fmt::format("  {:<38}{}  = 2000 x max(s, 0.41 d)", "minimum weight (USP <41>)",
                       grams_text(run, "min_weight_g")));
  for (const auto& l : wrap(str(run, "readability_statement"), 78, "  Readability: ", "    ")) add(out, l);
  add(out, "");
  add(out, fmt::format("Tolerances ({})", str(run, "policy_name")));
  for (const auto& cr : run.value("criteria", json::array())) {
    add(out, fmt::format("  {:<14} {} = {} against limit {}: {}", str(cr, "name"), str(cr, "quantity"),
                         mass_text(cr["measured_g"]), mass_text(cr["limit_g"]), cr.value("pass", false) ? "pass" : "FAIL"));
    add(out, fmt::format("  {:<14} limit basis: {}", "", str(cr, "basis")));
  }
  add(out, fmt::format("Decision rule: {}", str(c, "decision_rule")));
  add(out, "");
  std::string verdict = str(c, "verdict");
  std::transform(verdict.begin(), verdict.end(), verdict.begin(), ::toupper);
  if (str(c, "verdict") == "pass")
    add(out, fmt::format("VERDICT: {}    Next check due: {}", verdict, str(c, "next_due")));
  else
    add(out, fmt::format("VERDICT: {}    The instrument is OUT OF SERVICE until a passing check.", verdict));
  for (const auto& r : run.value("reasons", json::array()))
    for (const auto& l : wrap(r.get<std::string>(), 78, "  - ", "    ")) add(out, l);
  for (const auto& n : run.value("notes", json::array()))
    for (const auto& l : wrap(n.get<std::string>(), 78, "  Note: ", "    ")) add(out, l);
  add(out, "");
  add(out, "Signatures");
  for (const auto& s : c.value("signatories", json::array())) {
    const std::string name = str(s, "name", "");
    add(out, fmt::format("  {:<14} {:<24} signature ____________________  date __________", str(s, "role") + ":",
                         name.empty() ? "________________________" : name));
  }
  add(out, "");
  for (const auto& l : wrap(str(c, "caution"), 78, "Caution: ", "  ")) add(out, l);
  add(out, rule());
  add(out, fmt::format("Certificate content SHA-256: {}", content_sha256));
  return out;
}

}  // namespace plumb::report
