#include "report/calibration/in_use_section.hpp"

#include <fmt/format.h>

#include <string>

namespace plumb::report {
namespace {

using nlohmann::json;

std::string in_use_cell(const json& j, const char* key) {
  if (!j.is_object() || !j.contains(key) || j[key].is_null()) return "-";
  return j[key].is_string() ? j[key].get<std::string>() : j[key].dump();
}

double in_use_value(const json& j, const char* key) {
  return j.is_object() && j.contains(key) && j[key].is_number() ? j[key].get<double>() : 0.0;
}

// Grams with enough digits for a minimum weight read to 0.01 mg.
std::string in_use_grams(const json& j, const char* key) {
  return j.is_object() && j.contains(key) && j[key].is_number() ? fmt::format("{:.5f} g", j[key].get<double>()) : "-";
}

KeyValues declared_terms(const json& t) {
  KeyValues kv;
  kv.rows.reserve(6);  // (also keeps g++ 12's -Warray-bounds from a false alarm on the first emplace)
  kv.rows.emplace_back(
      "Declared terms",
      fmt::format("d_0 = {} g, d_L = {} g, s in use = {} g; temperature change {} K with TK = {} ppm/K; "
                  "sample density {} kg/m3 (u {}); air density u {} kg/m3; drift since calibration {} ppm",
                  in_use_cell(t, "rounding_zero_g"), in_use_cell(t, "rounding_load_g"),
                  in_use_cell(t, "repeatability_g"), in_use_cell(t, "temperature_change_k"),
                  in_use_cell(t, "sensitivity_ppm_per_k"), in_use_cell(t, "sample_density_kg_m3"),
                  in_use_cell(t, "sample_density_u_kg_m3"), in_use_cell(t, "air_density_u_kg_m3"),
                  in_use_cell(t, "drift_ppm")));
  kv.rows.emplace_back("Declared by",
                       fmt::format("{} at {}{}", in_use_cell(t, "set_by"), in_use_cell(t, "set_at"),
                                   t.value("reason", "").empty() ? "" : " (" + in_use_cell(t, "reason") + ")"));
  kv.rows.emplace_back("Required accuracy",
                       fmt::format("{} % with safety factor {}", in_use_cell(t, "required_accuracy_pct"),
                                   in_use_cell(t, "safety_factor")));
  return kv;
}

Table in_use_terms_table(const json& u) {
  Table t{{"Term of normal use", "u", "Kind", "Source"}, {1.9, 1.0, 0.6, 3.3}, {false, true, false, false}, {}};
  for (const auto& term : u.value("terms", json::array())) {
    const bool relative = term.value("relative", false);
    t.rows.push_back({in_use_cell(term, "source"),
                      relative ? fmt::format("{:.4e}", in_use_value(term, "u"))
                               : fmt::format("{:.5f} mg", in_use_value(term, "u") * 1e3),
                      relative ? "x W" : "absolute", in_use_cell(term, "note")});
  }
  return t;
}

KeyValues in_use_figures(const json& in, const json& u) {
  const bool corrected = u.value("error_corrected", false);
  KeyValues kv;
  kv.rows.reserve(6);  // (also keeps g++ 12's -Warray-bounds from a false alarm on the first emplace)
  kv.rows.emplace_back("Form",
                       fmt::format("{} form, results {}", u.value("form", "") == "linear" ? "linear" : "quadratic-sum",
                                   corrected ? "corrected for the error of indication (W = R - E(R))"
                                             : "not corrected for the error: |E| is added (global uncertainty)"));
  kv.rows.emplace_back("U(W)", in_use_cell(u, "formula"));
  kv.rows.emplace_back("Coefficients",
                       fmt::format("u(W)^2 = alpha^2 + beta^2 W^2 with alpha = {:.6f} mg, beta = {:.6e}; k = {:.2f}; "
                                   "linear a = {:.6f} mg, b = {:.6e}",
                                   in_use_value(u, "alpha_g") * 1e3, in_use_value(u, "beta"), in_use_value(u, "k"),
                                   in_use_value(u, "a_g") * 1e3, in_use_value(u, "b")));
  std::string at;
  for (const auto& p : u.value("at", json::array()))
    at += fmt::format("{}W = {:.6g} g: {:.4f} mg", at.empty() ? "" : "; ", in_use_value(p, "w_g"),
                      in_use_value(p, "U_g") * 1e3);
  kv.rows.emplace_back("U(W) at", at);
  kv.rows.emplace_back("Drawn from", fmt::format("the {} stage of this calibration", in_use_cell(in, "stage")));
  return kv;
}

KeyValues minimum_weights(const json& in, const json& u) {
  const json& usp = in.value("usp41", json());
  const json& mw = in.value("minimum_weight", json());
  KeyValues kv;
  kv.rows.reserve(6);  // (also keeps g++ 12's -Warray-bounds from a false alarm on the first emplace)
  const std::string from_cal =
      u.contains("minimum_weight_g") && u["minimum_weight_g"].is_number()
          ? fmt::format("{} ({})", in_use_grams(u, "minimum_weight_g"), in_use_cell(u, "minimum_weight_basis"))
          : "none: " + in_use_cell(u, "minimum_weight_absent");
  kv.rows.emplace_back("Minimum weight from calibration", from_cal);
  kv.rows.emplace_back("USP <41> minimum weight",
                       usp.contains("absent") ? in_use_cell(usp, "absent")
                                              : fmt::format("{} (weekly check run {} of {}, 2000 x max(s, 0.41 d))",
                                                            in_use_grams(usp, "minimum_weight_g"),
                                                            in_use_cell(usp, "run_id"), in_use_cell(usp, "date")));
  const std::string binding = mw.value("binding", json()).is_string() ? mw["binding"].get<std::string>() : "";
  kv.rows.emplace_back("Binding", binding == "calibration" ? "the minimum weight from calibration"
                                  : binding == "usp41"     ? "the USP <41> minimum weight"
                                                           : "none can be stated");
  return kv;
}

}  // namespace

void in_use_certificate_section(const json& in, Document& doc) {
  if (!in.is_object() || in.empty()) return;  // certificates issued before normal use was stated
  doc.blocks.push_back(Heading{"Weighing in normal use and minimum weight"});
  const json& t = in.value("terms", json());
  if (!t.is_object()) {
    doc.blocks.push_back(Paragraph{in_use_cell(in, "statement")});
    return;
  }
  const json& u = in.value("in_use", json());
  doc.blocks.push_back(declared_terms(t));
  doc.blocks.push_back(in_use_terms_table(u));
  doc.blocks.push_back(in_use_figures(in, u));
  doc.blocks.push_back(minimum_weights(in, u));
  if (u.contains("minimum_weight_note"))
    doc.blocks.push_back(Paragraph{"Note: " + in_use_cell(u, "minimum_weight_note"), true});
  doc.blocks.push_back(Paragraph{in_use_cell(in.value("minimum_weight", json()), "statement")});
  doc.blocks.push_back(Paragraph{"Sources: " + in_use_cell(in, "sources"), true});
  doc.blocks.push_back(Paragraph{in_use_cell(in.value("minimum_weight", json()), "caution"), true});
}

}  // namespace plumb::report
