#include "report/registry/weight_details.hpp"

#include <fmt/format.h>

namespace plumb::report {
namespace {

using nlohmann::json;

const store::WeightCalibration* in_force(const WeightDetails& d) {
  for (const auto& c : d.certificates)
    if (d.in_force_id && c.id == *d.in_force_id) return &c;
  return nullptr;
}

/// Milligrams from the exact grams: 0.03 mg prints as 0.03, not as the nearest double of 0.03 g times 1000.
double exact_mg(ExactMass m) {
  return m.in_grams().shifted(3).to_double();
}

void drop_trailing_spaces(std::string& line) {
  while (line.size() > 1 && line[line.size() - 2] == ' ') line.erase(line.size() - 2, 1);
}

std::string density_text(const WeightDetails& d) {
  if (!d.density_kg_m3) return "not known (" + d.density_source + ")";
  return fmt::format("{:.0f} kg/m3, u {:.3g} kg/m3 ({})", *d.density_kg_m3, d.u_density_kg_m3.value_or(0.0),
                     d.density_source);
}

json properties_json(const std::vector<store::WeightProperties>& history) {
  json out = json::array();
  for (const auto& p : history)
    out.push_back({{"density_kg_m3", p.density_kg_m3 ? json(p.density_kg_m3->to_string()) : json()},
                   {"u_density_kg_m3", p.u_density_kg_m3 ? json(p.u_density_kg_m3->to_string()) : json()},
                   {"density_class", p.density_class ? json(*p.density_class) : json()},
                   {"drift_g", p.drift ? json(p.drift->in_grams().to_string()) : json()},
                   {"by", p.by_name},
                   {"recorded_at", p.recorded_at}});
  return out;
}

}  // namespace

std::string weight_details_text(const WeightDetails& d) {
  const store::WeightRecord& w = d.weight;
  std::string out = fmt::format("Weight {}: nominal {}, OIML R 111-1:2004 class {}, density {}\n", w.id, w.nominal_text,
                                w.weight_class, density_text(d));
  if (!d.properties.empty() && d.properties.back().drift)
    out += fmt::format("Drift allowance D: {} (EURAMET cg-18: rectangular, u = D / sqrt 3)\n",
                       d.properties.back().drift->to_string());
  out += fmt::format("Status on {}: {}", to_string(d.on), d.status);
  if (const auto* c = in_force(d))
    out += fmt::format(" (certificate {} in force, due {})", c->certificate_no, to_string(c->due_on));
  out += "\n";
  if (d.retirement)
    out +=
        fmt::format("Retired {} by {}: {}\n", d.retirement->recorded_at, d.retirement->by_name, d.retirement->reason);
  constexpr const char* row = "  {:<16}{:<12}{:<12}{:<12}{:<12}{:<5}{:<22}{}\n";
  out += fmt::format("\nCertificates, oldest first ({}):\n", d.certificates.size());
  std::string header =
      fmt::format(row, "certificate", "calibrated", "due", "correction", "U", "k", "conventional mass (g)", "");
  drop_trailing_spaces(header);
  out += header;
  for (const auto& c : d.certificates) {
    std::string mark;
    if (d.in_force_id && c.id == *d.in_force_id) mark = "in force on " + to_string(d.on);
    if (d.overrides.count(c.id)) mark += mark.empty() ? "class override" : ", class override";
    std::string line = fmt::format(row, c.certificate_no, to_string(c.calibrated_on), to_string(c.due_on),
                                   c.correction.to_string(), c.uncertainty.to_string(), c.k.to_string(),
                                   (w.nominal + c.correction).in_grams().to_string(), mark);
    drop_trailing_spaces(line);
    out += line;
  }
  if (!d.overrides.empty()) {
    out +=
        "\nCertificates accepted outside the class (OIML R 111-1:2004: |correction| <= MPE, U (k = 2) <= MPE / 3):\n";
    for (const auto& c : d.certificates) {
      const auto it = d.overrides.find(c.id);
      if (it == d.overrides.end()) continue;
      const store::WeightClassOverride& o = it->second;
      const std::string mpe = o.mpe ? "MPE " + o.mpe->to_string() : "no MPE in Table 1";
      out += fmt::format("  {}: {} beyond class {} ({}), accepted by {} at {}: {}\n", c.certificate_no,
                         o.beyond == "no MPE" ? "class not checkable," : o.beyond, o.weight_class, mpe, o.by_name,
                         o.recorded_at, o.reason);
    }
  }
  if (!d.properties.empty()) {
    out += "\nDensity and drift statements, oldest first:\n";
    for (const auto& p : d.properties) {
      const std::string density =
          p.density_kg_m3
              ? fmt::format("density {} kg/m3, u {} kg/m3", p.density_kg_m3->to_string(),
                            p.u_density_kg_m3 ? p.u_density_kg_m3->to_string() : "-")
              : fmt::format("density from class {} (OIML R 111-1:2004 Table 5)", p.density_class.value_or("-"));
      out += fmt::format("  {} by {}: {}, drift allowance {}\n", p.recorded_at, p.by_name, density,
                         p.drift ? p.drift->to_string() : "none stated");
    }
  }
  return out;
}

json weight_details_json(const WeightDetails& d) {
  const store::WeightRecord& w = d.weight;
  json certificates = json::array();
  for (const auto& c : d.certificates) {
    json override_json = nullptr;
    if (const auto it = d.overrides.find(c.id); it != d.overrides.end()) {
      const store::WeightClassOverride& o = it->second;
      override_json = {{"class", o.weight_class}, {"mpe_mg", o.mpe ? json(exact_mg(*o.mpe)) : json()},
                       {"beyond", o.beyond},      {"reason", o.reason},
                       {"by", o.by_name},         {"recorded_at", o.recorded_at}};
    }
    certificates.push_back({{"certificate", c.certificate_no},
                            {"calibrated_on", to_string(c.calibrated_on)},
                            {"due_on", to_string(c.due_on)},
                            {"correction_mg", exact_mg(c.correction)},
                            {"uncertainty_mg", exact_mg(c.uncertainty)},
                            {"k", c.k.to_double()},
                            {"conventional_mass_g", (w.nominal + c.correction).approx().g()},
                            {"in_force", d.in_force_id && c.id == *d.in_force_id},
                            {"class_override", override_json}});
  }
  const auto* current = in_force(d);
  json retired = nullptr;
  if (d.retirement)
    retired = {{"reason", d.retirement->reason}, {"by", d.retirement->by_name}, {"at", d.retirement->recorded_at}};
  return {{"id", w.id},
          {"nominal", w.nominal_text},
          {"nominal_g", w.nominal.approx().g()},
          {"class", w.weight_class},
          {"standard", "OIML R 111-1:2004"},
          {"density_kg_m3", d.density_kg_m3 ? json(*d.density_kg_m3) : json()},
          {"u_density_kg_m3", d.u_density_kg_m3 ? json(*d.u_density_kg_m3) : json()},
          {"density_source", d.density_source},
          {"drift_allowance_g", !d.properties.empty() && d.properties.back().drift
                                    ? json(d.properties.back().drift->in_grams().to_string())
                                    : json()},
          {"properties", properties_json(d.properties)},
          {"on", to_string(d.on)},
          {"status", d.status},
          {"retired", retired},
          {"in_force_certificate", current ? json(current->certificate_no) : json()},
          {"certificates", certificates}};
}

}  // namespace plumb::report
