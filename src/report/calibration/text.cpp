#include "report/calibration/text.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "core/decimal.hpp"
#include "report/format/text.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

/// Decimals of d in grams (0.0001 -> 4).
int d_scale(const std::string& d_g) {
  return d_g.empty() ? 4 : Decimal::parse(d_g).significant_scale();
}

std::string mg(double g, int decimals) {
  return fmt::format("{:+.{}f}", g * 1e3, decimals);
}
std::string mg_unsigned(double g, int decimals) {
  return fmt::format("{:.{}f}", g * 1e3, decimals);
}

std::string dof_text(const json& v) {
  return v.is_number() ? fmt::format("{:.1f}", v.get<double>()) : "inf";
}

std::string grams_exact(const json& j, const char* key) {
  return j.contains(key) && j[key].is_string() ? j[key].get<std::string>() + " g" : "-";
}

}  // namespace

std::vector<std::string> conformity_state_meanings(const std::string& rule_key) {
  std::vector<std::string> out = {
      "pass: the error and its whole expanded-uncertainty interval lie inside the tolerance.",
      "fail: the error lies outside the tolerance" + std::string(rule_key == "guard-band" ? " by more than U." : "."),
  };
  if (rule_key == "guard-band") {
    out.insert(out.begin() + 1,
               "pass, not proven: the error is inside the tolerance but within U of a limit; conformity is not "
               "shown, and plumb does not accept it.");
    out.insert(out.begin() + 2,
               "fail, not proven: the error is outside the tolerance but within U of a limit; non-conformity is not "
               "shown either, and the instrument is treated as failing.");
  }
  return out;
}

std::vector<std::string> calibration_set_lines(const json& set, const std::string& d_g,
                                               const CalibrationTextOptions& options) {
  std::vector<std::string> out;
  const auto add = [&](const std::string& s) { out.push_back(s); };
  const int dg = d_scale(d_g);
  const int emg = std::max(1, dg - 3 + 2);  // E, U in mg: d's decimals plus two guard digits
  add("  Repeatability");
  add(fmt::format("    {:<14}{:>4}  {:>18}  {:>12}", "load", "n", "mean / g", "s / mg"));
  for (const auto& r : set.value("repeatability", json::array()))
    add(fmt::format("    {:<14}{:>4}  {:>18.{}f}  {:>12}", grams_exact(r, "load_g"), field_text(r, "n"),
                    number_field(r, "mean_g"), dg + 2, mg_unsigned(number_field(r, "sd_g"), emg)));
  const json& ecc = set.contains("eccentricity") ? set["eccentricity"] : json();
  if (ecc.is_null() || ecc.empty()) {
    add("  Eccentricity: not tested in this set.");
  } else {
    add(fmt::format("  Eccentricity at {} (centre reading {} g)", grams_exact(ecc, "load_g"),
                    field_text(ecc, "centre_g")));
    add(fmt::format("    {:<16}{:>16}{:>16}", "position", "reading / g", "deviation / g"));
    for (const auto& d : ecc["deviations"])
      add(fmt::format("    {:<16}{:>16}{:>16}", field_text(d, "position"), field_text(d, "reading_g"),
                      field_text(d, "deviation_g")));
    add(fmt::format("    largest |deviation| {} g at {} (relative {:.3g})", field_text(ecc, "max_abs_deviation_g"),
                    field_text(ecc, "max_position"), number_field(ecc, "relative_max")));
  }
  add("  Error of indication E = I - m_ref (E, U and tolerance in mg)");
  add(fmt::format("    {:>2} {:<16}{:>14}{:>14}{:>9}{:>8}{:>6}{:>7}{:>8}  {}", "#", "load", "m_ref / g", "I / g", "E",
                  "U", "k", "nu_eff", "+/-tol", "conformity"));
  for (const auto& l : set.value("loads", json::array())) {
    add(fmt::format("    {:>2} {:<16}{:>14.{}f}{:>14.{}f}{:>9}{:>8}{:>6.2f}{:>7}{:>8}  {}", field_text(l, "index"),
                    field_text(l, "combination"), number_field(l, "reference_g"), dg + 2, number_field(l, "indication_g"), dg + 1,
                    mg(number_field(l, "error_g"), emg), mg_unsigned(number_field(l, "U_g"), emg), number_field(l, "k"), dof_text(l["nu_eff"]),
                    mg_unsigned(number_field(l, "tolerance_g"), emg), field_text(l, "state")));
    if (l.contains("hysteresis_g") && l["hysteresis_g"].is_number())
      add(fmt::format("       going down {:.{}f} g, hysteresis {} mg", number_field(l, "indication_down_g"), dg + 1,
                      mg(number_field(l, "hysteresis_g"), emg)));
  }
  if (!set.value("loads", json::array()).empty())
    add(fmt::format("    tolerance basis (load 1): {}", field_text(set["loads"][0], "tolerance_basis")));
  const json& fit = set["fit"];
  const std::string model = field_text(fit, "model");
  add(fmt::format("  Fitted model ({}): {}", model, field_text(fit, "equation")));
  add(fmt::format("    as error: {}", field_text(fit, "error_equation")));
  const auto coef = fit.value("coef", std::vector<double>{});
  const auto se = fit.value("coef_se", std::vector<double>{});
  const std::vector<std::string> names =
      model == "through-origin" ? std::vector<std::string>{"slope b1"}
      : model == "quadratic"    ? std::vector<std::string>{"intercept b0 / g", "slope b1", "curvature b2 / g^-1"}
                                : std::vector<std::string>{"intercept b0 / g", "slope b1"};
  for (std::size_t i = 0; i < coef.size() && i < names.size(); ++i)
    add(fmt::format("    {:<22}{:>+20.10g}  +/- {:.3g} (SE)", names[i], coef[i], i < se.size() ? se[i] : 0.0));
  add(fmt::format("    R^2 = {:.12f} ({}), RMSE = {} mg, residual SD = {} mg, n = {}, dof = {}", number_field(fit, "r_squared"),
                  field_text(fit, "r_squared_kind"), mg_unsigned(number_field(fit, "rmse_g"), emg + 1),
                  mg_unsigned(number_field(fit, "residual_sd_g"), emg + 1), field_text(fit, "n"), field_text(fit, "dof")));
  std::string residuals = "    residuals / mg:";
  for (const auto& r : fit.value("residuals_g", std::vector<double>{})) residuals += " " + mg(r, emg + 1);
  add(residuals);
  add(fmt::format("    calibrated range {:.6g} g to {:.6g} g: the model is not used outside it.", number_field(fit, "x_min_g"),
                  number_field(fit, "x_max_g")));
  if (options.budgets) {
    add("  Uncertainty budget of E at each load (GUM; EURAMET cg-18), contributions in mg");
    for (const auto& l : set.value("loads", json::array())) {
      const json& b = l["budget"];
      add(fmt::format("    load {} ({})", field_text(l, "index"), field_text(l, "combination")));
      add(fmt::format("      {:<19}{:>12} {:<12}{:>8}{:>7}{:>13}{:>7}", "source", "value / mg", "distribution",
                      "divisor", "c_i", "u_i|c_i| /mg", "dof"));
      for (const auto& r : b["lines"])
        add(fmt::format("      {:<19}{:>12.{}f} {:<12}{:>8.4f}{:>7.1f}{:>13.{}f}{:>7}", field_text(r, "source"),
                        number_field(r, "value") * 1e3, emg + 1, field_text(r, "distribution"),
                        number_field(r, "divisor"), number_field(r, "sensitivity"),
                        number_field(r, "contribution_g") * 1e3, emg + 2, dof_text(r["dof"])));
      for (const auto& r : b["lines"])
        if (!field_text(r, "note", "").empty())
          for (const auto& note :
               wrap(field_text(r, "source") + ": " + field_text(r, "note"), 78, "      ", "        "))
            add(note);
      add(fmt::format("      u_c = {} mg, nu_eff = {}, k = {:.3f}, U = k u_c = {} mg",
                      mg_unsigned(number_field(b, "combined_g"), emg + 2), dof_text(b["nu_eff"]), number_field(b, "k"),
                      mg_unsigned(number_field(b, "expanded_g"), emg + 1)));
    }
  }
  for (const auto& n : set.value("notes", json::array()))
    for (const auto& l : wrap(n.get<std::string>(), 78, "  note: ", "    ")) add(l);
  add(fmt::format("  Result of this set: {}{}", field_text(set, "overall"),
                  set.value("weights_suitable", true) ? "" : " (some weights not suitable: see notes)"));
  return out;
}

std::string calibration_run_text(const json& r) {
  std::string out;
  const auto line = [&](const std::string& s) { out += s + "\n"; };
  line(fmt::format("Run {}: calibration of {} on {} by {}", field_text(r, "run_id"), field_text(r, "instrument"),
                   field_text(r, "date"), field_text(r, "operator")));
  const json& settings = r.contains("settings") ? r["settings"] : json::object();
  line(fmt::format("  settings      {}", field_text(settings, "description")));
  line(fmt::format("  model         {}", field_text(r, "model")));
  for (const auto& l : wrap(field_text(r["environment"], "statement"), 78, "  environment   ", "                "))
    line(l);
  for (const auto& w : r.value("weights_used", json::array()))
    line(fmt::format("  weight        {:<8} {} class {}, certificate {} (due {})", field_text(w, "id"),
                     field_text(w, "nominal"), field_text(w, "class"), field_text(w, "certificate"),
                     field_text(w, "due_on")));
  line(fmt::format("  decision rule {}", field_text(r, "decision_rule")));
  const std::string d = field_text(r, "readability_g", "");
  line("");
  line("AS FOUND");
  for (const auto& l : calibration_set_lines(r["as_found"], d)) line(l);
  if (r.contains("as_left") && !r["as_left"].is_null()) {
    line("");
    line("AS LEFT (after adjustment)");
    for (const auto& l : calibration_set_lines(r["as_left"], d)) line(l);
  }
  line("");
  for (const auto& n : r.value("notes", json::array()))
    for (const auto& l : wrap(n.get<std::string>(), 78, "note: ", "  ")) line(l);
  if (field_text(r, "verdict") == "pass")
    line(fmt::format("Verdict: PASS ({} {}); next calibration due {}", field_text(r, "final_stage"),
                     field_text(r, "final_state"), field_text(r, "next_due")));
  else
    line(fmt::format("Verdict: FAIL ({} {}): out of service until a passing calibration", field_text(r, "final_stage"),
                     field_text(r, "final_state")));
  return out;
}

std::string calibration_error_at_text(const json& a) {
  std::string out;
  const auto line = [&](const std::string& l) { add_line(out, l); };
  // One decimal finer than d, in mg: d = 0.1 mg gives "+0.07 mg".
  const int decimals = std::max(0, d_scale(field_text(a, "readability_g", "")) - 3) + 1;
  line(fmt::format("Run {}: calibration of {} on {}, {} ({} model)", field_text(a, "run_id"),
                   field_text(a, "instrument"), field_text(a, "date"), field_text(a, "stage"), field_text(a, "model")));
  line(fmt::format("  fitted error at {}: E = {} mg (standard error of the fit {} mg){}", field_text(a, "load"),
                   mg(number_field(a, "error_g"), decimals), mg_unsigned(number_field(a, "se_g"), decimals),
                   a.value("extrapolated", false) ? "; EXTRAPOLATED: outside the calibrated range, not reliable" : ""));
  if (const json& o = a.value("over_range", json()); o.is_object()) {
    line(
        fmt::format("  over the range (EURAMET cg-18 v4.0, {}): at R = {:.10g} g, E = {} mg, u = {} mg, U = {} mg "
                    "(k = {:.2f})",
                    field_text(o, "form"), number_field(o, "reading_g"), mg(number_field(o, "error_g"), decimals + 1),
                    mg_unsigned(number_field(o, "u_g"), decimals + 1),
                    mg_unsigned(number_field(o, "U_g"), decimals + 1), number_field(o, "k")));
    line(fmt::format("    {}; {}", field_text(o, "error_formula"), field_text(o, "uncertainty_formula")));
  }
  for (const auto& l : a.value("nearest_calibrated_loads", json::array()))
    line(fmt::format("  calibrated load {} ({} g): E = {} mg, U = {} mg (k = {:.2f})", field_text(l, "index"),
                     fmt::format("{:.10g}", number_field(l, "reference_g")), mg(number_field(l, "error_g"), decimals),
                     mg_unsigned(number_field(l, "U_g"), decimals), number_field(l, "k")));
  line(
      "U is stated at the calibrated loads (EURAMET cg-18 v4.0); between them the error and its uncertainty are "
      "read from the approximation over the range.");
  return out;
}

}  // namespace plumb::report
