// Sections of the balance calibration certificate (kind "balance_calibration", content from
// app/calibration/certificate_content.cpp): calibration and environment, air density, traceability of every weight,
// per stage (as found / as left) the error of indication table and the fitted model, a chart of E against the
// load (report/calibration/error_chart), the uncertainty budget of the final stage, and the decision rule with
// what its states mean.
#include <fmt/format.h>
#include <fmt/ranges.h>

#include <algorithm>
#include <cmath>

#include "core/decimal.hpp"
#include "core/units.hpp"
#include "report/calibration/error_chart.hpp"
#include "report/calibration/in_use_section.hpp"
#include "report/certificates/document.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

double num(const json& j, const char* key) {
  return j.contains(key) && j[key].is_number() ? j[key].get<double>() : 0;
}

std::string exact_grams(const json& j, const char* key) {
  if (!j.contains(key) || !j[key].is_string()) return "-";
  return ExactMass::grams(Decimal::parse(j[key].get<std::string>())).to_string();
}

// E, U and tolerances in mg with d's decimals plus two guard digits, as the text certificate prints them.
struct MgFormat {
  int decimals = 3;
  [[nodiscard]] std::string signed_mg(double g) const { return fmt::format("{:+.{}f}", g * 1e3, decimals); }
  [[nodiscard]] std::string mg(double g) const { return fmt::format("{:.{}f}", g * 1e3, decimals); }
};

MgFormat mg_format(const json& cal) {
  const json& d = cal.value("readability_g", json());
  const int dg = d.is_string() ? Decimal::parse(d.get<std::string>()).significant_scale() : 4;
  return {std::max(1, dg - 3 + 2)};
}

void calibration_block(const json& c, Document& doc) {
  const json& cal = c["calibration"];
  const json& run = c.value("check", json::object());
  doc.blocks.push_back(Heading{"Calibration"});
  doc.blocks.push_back(KeyValues{{{"Run", cell(run, "run_id")},
                                  {"Performed", fmt::format("{} by {}", cell(run, "date"), cell(run, "operator"))},
                                  {"Procedure", cell(cal, "procedure")},
                                  {"Settings", cell(cal.value("settings", json::object()), "description")},
                                  {"Tolerance", cell(cal, "tolerance")},
                                  {"Fitted model", cell(cal, "model")}}});
}

void environment_block(const json& cal, Document& doc) {
  const json& env = cal.value("environment", json::object());
  const json& air = cal.value("air", json());
  doc.blocks.push_back(Heading{"Environment and air density"});
  KeyValues kv;
  if (env.value("measured", false))
    kv.rows.emplace_back("Conditions",
                         fmt::format("temperature {} degC, pressure {} hPa, relative humidity {} %",
                                     cell(env, "temperature_c"), cell(env, "pressure_hpa"), cell(env, "humidity_pct")));
  if (air.is_object() && air.contains("rho_kg_m3"))
    kv.rows.emplace_back("Air density", fmt::format("{:.5f} kg/m3, u = {:.5f} kg/m3 ({})", num(air, "rho_kg_m3"),
                                                    num(air, "u_kg_m3"), cell(air, "formula")));
  else
    kv.rows.emplace_back("Air density", "not computed (no conditions measured)");
  kv.rows.emplace_back("Statement", cell(env, "statement"));
  doc.blocks.push_back(std::move(kv));
}

void weights_block(const json& weights, Document& doc) {
  doc.blocks.push_back(Heading{"Reference weights (traceability)"});
  Table t{
      {"Weight", "Nominal", "Class", "Conventional mass", "Density kg/m3", "U (k)", "Certificate", "Calibrated", "Due"},
      {0.7, 0.7, 0.5, 1.3, 0.9, 1.2, 1.0, 0.9, 0.9},
      {false, true, false, true, true, true, false, false, false},
      {}};
  for (const auto& w : weights)
    t.rows.push_back({cell(w, "id"), cell(w, "nominal"), cell(w, "class"), exact_grams(w, "conventional_mass_g"),
                      cell(w, "density_kg_m3") + (w.value("density_assumed", false) ? " (assumed)" : ""),
                      fmt::format("{} ({})", exact_grams(w, "uncertainty_g"), cell(w, "k")), cell(w, "certificate"),
                      cell(w, "calibrated_on"), cell(w, "due_on")});
  doc.blocks.push_back(std::move(t));
  std::vector<std::string> drift;
  for (const auto& w : weights)
    drift.push_back(fmt::format("{}: {}", cell(w, "id"),
                                w.contains("drift_g") && w["drift_g"].is_string() ? exact_grams(w, "drift_g") : "0 g"));
  if (!weights.empty() && weights[0].contains("drift_basis"))
    doc.blocks.push_back(Paragraph{fmt::format("Drift allowance since the weights' calibration ({}): {}.",
                                               cell(weights[0], "drift_basis"), fmt::join(drift, "; ")),
                                   true});
}

Table error_table(const json& stage, const MgFormat& f) {
  Table t{{"#", "Load", "m_ref / g", "I / g", "E / mg", "U / mg", "k", "MPE / mg", "Conformity"},
          {0.3, 1.2, 1.2, 1.2, 0.8, 0.8, 0.5, 0.8, 1.3},
          {true, false, true, true, true, true, true, true, false},
          {}};
  for (const auto& l : stage.value("error_of_indication", json::array()))
    t.rows.push_back({cell(l, "index"), cell(l, "load"), fmt::format("{:.7f}", num(l, "reference_g")),
                      fmt::format("{:.7f}", num(l, "indication_g")), f.signed_mg(num(l, "error_g")),
                      f.mg(num(l, "U_g")), fmt::format("{:.2f}", num(l, "k")), "\u00b1" + f.mg(num(l, "tolerance_g")),
                      cell(l, "conformity")});
  return t;
}

KeyValues model_block(const json& fit, const MgFormat& f) {
  KeyValues kv;
  kv.rows.emplace_back("Model", fmt::format("{}: {}", cell(fit, "model"), cell(fit, "equation")));
  kv.rows.emplace_back("As error", cell(fit, "error_equation"));
  const auto coef = fit.value("coef", std::vector<double>{});
  const auto se = fit.value("coef_se", std::vector<double>{});
  std::string coefs;
  for (std::size_t i = 0; i < coef.size(); ++i)
    coefs += fmt::format("{}b{} = {:+.10g} (SE {:.3g})", i ? "; " : "",
                         fit.value("model", "") == "through-origin" ? 1 : i, coef[i], i < se.size() ? se[i] : 0.0);
  kv.rows.emplace_back("Coefficients", coefs);
  kv.rows.emplace_back("Statistics",
                       fmt::format("R\u00b2 = {:.12f} ({}), RMSE = {} mg, residual SD = {} mg, n = {}, dof = {}",
                                   num(fit, "r_squared"), cell(fit, "r_squared_kind"), f.mg(num(fit, "rmse_g")),
                                   f.mg(num(fit, "residual_sd_g")), cell(fit, "n"), cell(fit, "dof")));
  kv.rows.emplace_back("Range", fmt::format("{:.6g} g to {:.6g} g; the model is not used outside it",
                                            num(fit, "x_min_g"), num(fit, "x_max_g")));
  return kv;
}

// EURAMET cg-18 v4.0's approximation of E and u(E) as functions of the reading, with its coefficients.
void range_approximation_block(const json& a, const MgFormat& f, Document& doc) {
  if (!a.is_object() || a.empty()) return;
  const auto coef = a.value("error_coef", std::vector<double>{});
  std::string coefs;
  const bool through_zero = a.value("model", "") == "through-origin";
  for (std::size_t i = 0; i < coef.size(); ++i) {
    const bool offset = !through_zero && i == 0;  // a0 is a mass: in mg like E; a1, a2 are per gram of R
    coefs += fmt::format(
        "{}a{} = {}", i ? "; " : "", through_zero ? 1 : i,
        offset ? fmt::format("{:+.6f} mg", coef[i] * 1e3) : fmt::format("{:+.6e}{}", coef[i], i == 2 ? " /g" : ""));
  }
  KeyValues kv;
  kv.rows.reserve(5);  // (also keeps g++ 12's -Warray-bounds from a false alarm on the first emplace)
  kv.rows.emplace_back("Error over the range", fmt::format("{}: {}", cell(a, "form"), cell(a, "error_formula")));
  kv.rows.emplace_back("Error coefficients", coefs);
  kv.rows.emplace_back("Uncertainty over the range", cell(a, "uncertainty_formula"));
  kv.rows.emplace_back("Uncertainty coefficients",
                       fmt::format("alpha = {} mg; beta = {:.6e}; k = {:.2f}",
                                   MgFormat{f.decimals + 1}.mg(num(a, "alpha_g")), num(a, "beta"), num(a, "k")));
  kv.rows.emplace_back("Valid for readings",
                       fmt::format("{:.6g} g to {:.6g} g", num(a, "reading_min_g"), num(a, "reading_max_g")));
  doc.blocks.push_back(std::move(kv));
  doc.blocks.push_back(Paragraph{cell(a, "statement"), true});
}

void budget_block(const json& stage, const MgFormat& f, Document& doc) {
  const json& rows = stage.value("error_of_indication", json::array());
  if (rows.empty()) return;
  doc.blocks.push_back(Heading{fmt::format("Uncertainty budget, {} (final stage)", stage.value("title", ""))});
  doc.blocks.push_back(
      Paragraph{"The budget of E at every load; contributions u_i |c_i| in mg (GUM, EURAMET cg-18).", true});
  const auto dof = [](const json& v) { return v.is_number() ? fmt::format("{:.1f}", v.get<double>()) : "inf"; };
  const MgFormat fine{f.decimals + 1};
  for (const auto& l : rows) {
    doc.blocks.push_back(Paragraph{fmt::format(
        "Load {} ({}, {:.6g} g): u_c = {} mg, nu_eff = {}, k = {:.3f}, U = k u_c "
        "= {} mg.",
        cell(l, "index"), cell(l, "load"), num(l, "reference_g"), MgFormat{f.decimals + 2}.mg(num(l, "u_c_g")),
        dof(l.value("nu_eff", json())), num(l, "k"), fine.mg(num(l, "U_g")))});
    Table t{{"Source", "Value / mg", "Distribution", "Divisor", "c_i", "u_i |c_i| / mg", "dof", "Share"},
            {1.6, 0.9, 1.0, 0.7, 0.5, 1.0, 0.6, 0.6},
            {false, true, false, true, true, true, true, true},
            {}};
    for (const auto& b : l.value("budget", json::array()))
      t.rows.push_back({cell(b, "source"), fine.mg(num(b, "value")), cell(b, "distribution"),
                        fmt::format("{:.4f}", num(b, "divisor")), fmt::format("{:.1f}", num(b, "sensitivity")),
                        MgFormat{f.decimals + 2}.mg(num(b, "contribution_g")), dof(b.value("dof", json())),
                        fmt::format("{:.1f} %", num(b, "share") * 100)});
    doc.blocks.push_back(std::move(t));
    for (const auto& b : l.value("budget", json::array()))
      if (!b.value("note", "").empty())
        doc.blocks.push_back(Paragraph{cell(b, "source") + ": " + cell(b, "note"), true});
  }
  Table per_load{{"#", "Load", "u_c / mg", "nu_eff", "k", "U = k u_c / mg"},
                 {0.3, 1.4, 1.0, 0.8, 0.6, 1.1},
                 {true, false, true, true, true, true},
                 {}};
  for (const auto& l : rows)
    per_load.rows.push_back({cell(l, "index"), cell(l, "load"), fine.mg(num(l, "u_c_g")),
                             dof(l.value("nu_eff", json())), fmt::format("{:.2f}", num(l, "k")), f.mg(num(l, "U_g"))});
  doc.blocks.push_back(Paragraph{"Combined and expanded uncertainty at every load of the final stage:", true});
  doc.blocks.push_back(std::move(per_load));
}

// The repeatability and eccentricity tests of one set (as found or as left), from the stored run results.
void set_tests_block(const json& set, const MgFormat& f, Document& doc) {
  Table rep{{"Repeatability at load", "n", "Mean / g", "s / mg"}, {1.4, 0.4, 1.2, 0.8}, {false, true, true, true}, {}};
  for (const auto& r : set.value("repeatability", json::array()))
    rep.rows.push_back(
        {exact_grams(r, "load_g"), cell(r, "n"), fmt::format("{:.6f}", num(r, "mean_g")), f.mg(num(r, "sd_g"))});
  if (!rep.rows.empty()) doc.blocks.push_back(std::move(rep));
  const json& ecc = set.value("eccentricity", json());
  if (!ecc.is_object() || ecc.empty()) {
    doc.blocks.push_back(Paragraph{"Eccentricity: not tested in this set.", true});
    return;
  }
  doc.blocks.push_back(
      Paragraph{fmt::format("Eccentricity at {} (centre reading {} g); largest |deviation| {} g at {} "
                            "(relative {:.3g}).",
                            exact_grams(ecc, "load_g"), cell(ecc, "centre_g"), cell(ecc, "max_abs_deviation_g"),
                            cell(ecc, "max_position"), num(ecc, "relative_max")),
                true});
  Table t{{"Position", "Reading / g", "Deviation from centre / g"}, {1.2, 1.0, 1.4}, {false, true, true}, {}};
  for (const auto& d : ecc.value("deviations", json::array()))
    t.rows.push_back({cell(d, "position"), cell(d, "reading_g"), cell(d, "deviation_g")});
  doc.blocks.push_back(std::move(t));
}

// Hysteresis where a load was also read going down, and the residuals of the fit.
void set_details_block(const json& set, const MgFormat& f, Document& doc) {
  Table hys{{"Load", "I going up / g", "I going down / g", "Hysteresis / mg"},
            {1.2, 1.1, 1.1, 1.0},
            {false, true, true, true},
            {}};
  for (const auto& l : set.value("loads", json::array()))
    if (l.contains("hysteresis_g") && l["hysteresis_g"].is_number())
      hys.rows.push_back({cell(l, "combination"), fmt::format("{:.7f}", num(l, "indication_g")),
                          fmt::format("{:.7f}", num(l, "indication_down_g")), f.signed_mg(num(l, "hysteresis_g"))});
  if (!hys.rows.empty()) doc.blocks.push_back(std::move(hys));
  std::vector<std::string> residuals;
  for (const auto& r : set.value("fit", json::object()).value("residuals_g", std::vector<double>{}))
    residuals.push_back(MgFormat{f.decimals + 1}.signed_mg(r));
  if (!residuals.empty())
    doc.blocks.push_back(Paragraph{fmt::format("Residuals of the fit / mg: {}.", fmt::join(residuals, ", ")), true});
  if (!set.value("loads", json::array()).empty())
    doc.blocks.push_back(
        Paragraph{"Tolerance basis (load 1): " + cell(set["loads"][0], "tolerance_basis") + ".", true});
  doc.blocks.push_back(
      Paragraph{fmt::format("Result of this set: {}{}.", cell(set, "overall"),
                            set.value("weights_suitable", true) ? "" : " (some weights not suitable: see the notes)")});
}

void decision_block(const json& cal, Document& doc) {
  const json& rule = cal.value("decision_rule", json::object());
  doc.blocks.push_back(Heading{"Decision rule"});
  doc.blocks.push_back(Paragraph{cell(rule, "statement")});  // the statement names the rule itself
  for (const auto& m : rule.value("state_meanings", json::array()))
    doc.blocks.push_back(Paragraph{"- " + m.get<std::string>(), true});
}

}  // namespace

void balance_calibration_sections(const json& c, Document& doc) {
  if (!c.contains("calibration") || !c["calibration"].is_object()) return;
  const json& cal = c["calibration"];
  const MgFormat f = mg_format(cal);
  calibration_block(c, doc);
  environment_block(cal, doc);
  weights_block(c.value("weights", json::array()), doc);

  const json& stages = cal.value("stages", json::array());
  const std::string final_key = cal.value("final_stage", "");
  const json* final_stage = nullptr;
  for (const auto& st : stages) {
    doc.blocks.push_back(Heading{fmt::format("{}: {}", st.value("title", ""), cell(st, "state"))});
    const json& set = c.value("check", json::object())
                          .value(st.value("stage", "") == "as-left" ? "as_left" : "as_found", json::object());
    if (set.is_object()) set_tests_block(set, f, doc);
    doc.blocks.push_back(Paragraph{
        "Error of indication E = I - m_ref; U = k u_c; MPE from the tolerance (" + cell(cal, "tolerance") + ").",
        true});
    doc.blocks.push_back(error_table(st, f));
    doc.blocks.push_back(model_block(st.value("fit", json::object()), f));
    range_approximation_block(st.value("range_approximation", json()), f, doc);
    if (set.is_object()) set_details_block(set, f, doc);
    for (const auto& n : st.value("notes", json::array()))
      doc.blocks.push_back(Paragraph{"Note: " + n.get<std::string>(), true});
    if (st.value("stage", "") == final_key) final_stage = &st;
  }
  if (!final_stage && !stages.empty()) final_stage = &stages.back();
  if (final_stage && final_stage->value("error_of_indication", json::array()).size() >= 2) {
    doc.blocks.push_back(Heading{"Error of indication against load"});
    doc.blocks.push_back(ChartBlock{calibration_error_chart(c)});
  }
  if (final_stage) budget_block(*final_stage, f, doc);
  in_use_certificate_section(c.value("in_use", json()), doc);
  decision_block(cal, doc);
  if (cal.value("adjusted", false) && stages.size() > 1)
    doc.blocks.push_back(Paragraph{fmt::format("The balance was adjusted: as found {}, as left {}.",
                                               cell(stages[0], "state"), cell(stages[1], "state"))});
  else if (!stages.empty())
    doc.blocks.push_back(Paragraph{fmt::format("No adjustment was made: as found {}.", cell(stages[0], "state"))});
  for (const auto& n : cal.value("notes", json::array()))
    doc.blocks.push_back(Paragraph{"Note: " + n.get<std::string>(), true});
  history_chart_section(c, doc);
}

}  // namespace plumb::report
