#include "report/calibration/in_use_text.hpp"

#include <fmt/format.h>

namespace plumb::report {
namespace {

using nlohmann::json;

std::string in_use_text_of(const json& j, const char* key) {
  if (!j.is_object() || !j.contains(key) || j[key].is_null()) return "-";
  return j[key].is_string() ? j[key].get<std::string>() : j[key].dump();
}

double in_use_number_of(const json& j, const char* key) {
  return j.is_object() && j.contains(key) && j[key].is_number() ? j[key].get<double>() : 0.0;
}

}  // namespace

std::string balance_in_use_text(const json& a) {
  std::string out;
  const auto line = [&](const std::string& l) { out += l + "\n"; };
  line(fmt::format("Balance {} in use on {} (capacity {} g, d = {} g)", in_use_text_of(a, "balance"),
                   in_use_text_of(a, "on"), in_use_text_of(a, "capacity_g"), in_use_text_of(a, "readability_g")));
  const json& t = a.value("terms", json());
  if (t.is_object()) {
    line(fmt::format("  declared terms (row {}, set {} by {}{}):", in_use_text_of(t, "row"),
                     in_use_text_of(t, "set_at"), in_use_text_of(t, "set_by"),
                     t.value("reason", "").empty() ? "" : ": " + in_use_text_of(t, "reason")));
    line(fmt::format("    rounding at zero d_0 = {} g, at load d_L = {} g, repeatability in use s = {} g",
                     in_use_text_of(t, "rounding_zero_g"), in_use_text_of(t, "rounding_load_g"),
                     in_use_text_of(t, "repeatability_g")));
    line(
        fmt::format("    temperature change {} K with TK = {} ppm/K; sample density {} kg/m3 (u {}), air density u {} "
                    "kg/m3; drift since calibration {} ppm",
                    in_use_text_of(t, "temperature_change_k"), in_use_text_of(t, "sensitivity_ppm_per_k"),
                    in_use_text_of(t, "sample_density_kg_m3"), in_use_text_of(t, "sample_density_u_kg_m3"),
                    in_use_text_of(t, "air_density_u_kg_m3"), in_use_text_of(t, "drift_ppm")));
    line(fmt::format("    results {}; form {}; required accuracy {} % with safety factor {}",
                     t.value("error_corrected", false) ? "corrected for the error of indication" : "not corrected",
                     in_use_text_of(t, "form"), in_use_text_of(t, "required_accuracy_pct"),
                     in_use_text_of(t, "safety_factor")));
  } else {
    line("  no terms of normal use declared (plumb balance set-in-use)");
  }
  const json& cal = a.value("calibration", json());
  if (cal.contains("absent")) {
    line("  calibration: " + in_use_text_of(cal, "absent"));
  } else {
    const json& r = cal.value("range_approximation", json());
    line(fmt::format("  calibration run {} of {} ({}{}): {}", in_use_text_of(cal, "run_id"),
                     in_use_text_of(cal, "date"), in_use_text_of(cal, "stage"),
                     cal.value("certificate", "").empty() ? "" : ", certificate " + in_use_text_of(cal, "certificate"),
                     in_use_text_of(r, "error_formula")));
    line(fmt::format("    {}, k = {:.2f}, readings {:.6g} g to {:.6g} g", in_use_text_of(r, "uncertainty_formula"),
                     in_use_number_of(r, "k"), in_use_number_of(r, "reading_min_g"),
                     in_use_number_of(r, "reading_max_g")));
  }
  const json& u = a.value("in_use", json());
  if (u.is_object()) {
    line("  uncertainty of a weighing result in use (EURAMET cg-18 v4.0):");
    for (const auto& term : u.value("terms", json::array()))
      line(fmt::format("    {:<28} u = {:.4g} {}  ({})", in_use_text_of(term, "source"),
                       term.value("relative", false) ? in_use_number_of(term, "u") : in_use_number_of(term, "u") * 1e3,
                       term.value("relative", false) ? "x W" : "mg", in_use_text_of(term, "note")));
    line("    " + in_use_text_of(u, "formula"));
    for (const auto& p : u.value("at", json::array()))
      line(fmt::format("    at W = {:.6g} g: U(W) = {:.4g} mg", in_use_number_of(p, "w_g"),
                       in_use_number_of(p, "U_g") * 1e3));
    if (u.contains("minimum_weight_g") && u["minimum_weight_g"].is_number())
      line(fmt::format("  minimum weight from calibration: {:.6g} g ({})", in_use_number_of(u, "minimum_weight_g"),
                       in_use_text_of(u, "minimum_weight_basis")));
    if (u.contains("minimum_weight_note"))
      line("    note: " + in_use_text_of(u, "minimum_weight_note"));
    else if (!(u.contains("minimum_weight_g") && u["minimum_weight_g"].is_number()))
      line("  minimum weight from calibration: none (" + in_use_text_of(u, "minimum_weight_absent") + ")");
  }
  const json& usp = a.value("usp41", json());
  if (usp.contains("absent"))
    line("  USP <41> minimum weight: " + in_use_text_of(usp, "absent"));
  else
    line(fmt::format("  USP <41> minimum weight: {:.6g} g (weekly check run {} of {}, 2000 x max(s, 0.41 d))",
                     in_use_number_of(usp, "minimum_weight_g"), in_use_text_of(usp, "run_id"),
                     in_use_text_of(usp, "date")));
  const json& mw = a.value("minimum_weight", json());
  line(in_use_text_of(mw, "statement"));
  line(in_use_text_of(mw, "caution"));
  return out;
}

}  // namespace plumb::report
