#include "report/calibration/json.hpp"

#include <fmt/format.h>

#include <cmath>

#include "core/errors.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

json finite_or_null(double v) { return std::isfinite(v) ? json(v) : json(); }

/// Exact readings as decimal text in grams, with the decimals displayed.
json grams_text(const std::vector<ExactMass>& v) {
  json out = json::array();
  for (const auto& m : v) out.push_back(m.in_grams().to_string());
  return out;
}

json grams(const std::optional<Mass>& m) {
  return m ? json(m->g()) : json();
}

json load_json(const checks::LoadCalibration& lc) {
  const auto& L = lc.load;
  const auto& d = lc.decision;
  return {{"index", L.index},
          {"combination", L.combination},
          {"weight_ids", L.weight_ids},
          {"nominal_g", L.nominal.in_grams().to_string()},
          {"conventional_g", L.conventional.in_grams().to_string()},
          {"buoyancy_correction_g", L.buoyancy_correction.g()},
          {"u_buoyancy_g", L.u_buoyancy.g()},
          {"reference_g", L.reference.g()},
          {"up_g", grams_text(L.up)},
          {"down_g", grams_text(L.down)},
          {"indication_g", L.indication.g()},
          {"error_g", L.error.g()},
          {"error_exact_g", L.error_exact ? json(L.error_exact->in_grams().to_string()) : json()},
          {"indication_down_g", grams(L.indication_down)},
          {"hysteresis_g", grams(L.hysteresis)},
          {"residual_g", L.residual.g()},
          {"u_weights_g", L.u_weights.g()},
          {"u_drift_g", L.u_drift.g()},
          {"class_only", L.class_only},
          {"budget", to_json(lc.budget)},
          {"u_c_g", lc.budget.combined},
          {"nu_eff", finite_or_null(lc.budget.nu_eff)},
          {"k", lc.budget.k},
          {"U_g", lc.budget.expanded},
          {"tolerance_g", lc.tolerance.g()},
          {"tolerance_basis", lc.tolerance_basis},
          {"state", std::string(checks::to_string(d.state))},
          {"state_key", std::string(checks::key(d.state))},
          {"guard_band_g", d.guard_band.g()},
          {"acceptance_lower_g", grams(d.acceptance_lower)},
          {"acceptance_upper_g", grams(d.acceptance_upper)},
          {"acceptance_zone_empty", d.acceptance_zone_empty},
          {"explanation", d.explanation},
          {"weight_uncertainty_g", lc.weight_uncertainty.g()},
          {"weight_suitable", lc.weight_suitable},
          {"repeatability_series", lc.repeatability_series}};
}

json set_json(const checks::CalibrationSetResult& s) {
  json reps = json::array();
  for (const auto& r : s.repeatability)
    reps.push_back({{"load_g", r.load.in_grams().to_string()}, {"n", r.n}, {"mean_g", r.mean.g()}, {"sd_g", r.sd.g()}});
  json ecc;
  if (s.eccentricity) {
    const auto& e = *s.eccentricity;
    json devs = json::array();
    for (const auto& d : e.deviations)
      devs.push_back({{"position", d.name},
                      {"reading_g", d.reading.in_grams().to_string()},
                      {"deviation_g", d.deviation.in_grams().to_string()}});
    ecc = {{"load_g", e.load.in_grams().to_string()},
           {"centre_g", e.centre.in_grams().to_string()},
           {"deviations", devs},
           {"max_abs_deviation_g", e.max_abs_deviation.in_grams().to_string()},
           {"max_position", e.max_position},
           {"relative_max", e.relative_max}};
  }
  json loads = json::array();
  for (const auto& l : s.loads) loads.push_back(load_json(l));
  const auto& lin = s.linearity;
  json fit = to_json(lin.fit);
  fit["equation"] = lin.equation;
  fit["error_equation"] = lin.error_equation;
  return {{"repeatability", reps},
          {"eccentricity", ecc},
          {"loads", loads},
          {"fit", fit},
          {"max_abs_error_g", lin.max_abs_error.g()},
          {"max_error_load", lin.max_error_load},
          {"max_abs_hysteresis_g", grams(lin.max_abs_hysteresis)},
          {"overall", std::string(checks::to_string(s.overall))},
          {"overall_key", std::string(checks::key(s.overall))},
          {"weights_suitable", s.weights_suitable},
          {"notes", s.notes}};
}

}  // namespace

std::string_view model_key(stats::Model m) {
  switch (m) {
    case stats::Model::line: return "line";
    case stats::Model::through_origin: return "through-origin";
    case stats::Model::quadratic: return "quadratic";
  }
  return "line";
}

stats::Model parse_model(std::string_view text, std::string_view field) {
  if (text == "line") return stats::Model::line;
  if (text == "through-origin") return stats::Model::through_origin;
  if (text == "quadratic") return stats::Model::quadratic;
  throw InputError(fmt::format("{} \"{}\" is not line, through-origin or quadratic.", field, text));
}

json to_json(const stats::BudgetResult& b) {
  json lines = json::array();
  for (const auto& l : b.lines)
    lines.push_back({{"source", l.input.source},
                     {"value", l.input.value},
                     {"distribution", std::string(stats::to_string(l.input.distribution))},
                     {"divisor", l.input.divisor},
                     {"standard_uncertainty", l.standard_uncertainty},
                     {"sensitivity", l.input.sensitivity},
                     {"contribution_g", l.contribution},
                     {"dof", finite_or_null(l.input.dof)},
                     {"share", l.share},
                     {"note", l.input.note}});
  return {{"measurand", b.measurand},
          {"unit", b.unit},
          {"lines", lines},
          {"combined_g", b.combined},
          {"nu_eff", finite_or_null(b.nu_eff)},
          {"dof_used", finite_or_null(b.dof_used)},
          {"coverage_probability", b.coverage_probability},
          {"k", b.k},
          {"expanded_g", b.expanded},
          {"k_fixed", b.k_fixed},
          {"statement", b.statement()}};
}

json to_json(const stats::Fit& f) {
  return {{"model", std::string(model_key(f.model))},
          {"coef", f.coef},
          {"coef_se", f.coef_se},
          {"n", f.n},
          {"dof", f.dof},
          {"residual_sd_g", f.residual_sd},
          {"r_squared", f.r_squared},
          {"r_squared_kind", f.model == stats::Model::through_origin ? "uncentred" : "centred"},
          {"rmse_g", f.rmse},
          {"sse", f.sse},
          {"x_min_g", f.x_min},
          {"x_max_g", f.x_max},
          {"residuals_g", f.residuals},
          {"xtx_inverse", f.xtx_inverse}};
}

stats::Fit fit_from_json(const json& j) {
  stats::Fit f;
  f.model = parse_model(j.at("model").get<std::string>(), "stored model");
  f.coef = j.at("coef").get<std::vector<double>>();
  f.coef_se = j.at("coef_se").get<std::vector<double>>();
  f.n = j.at("n").get<std::size_t>();
  f.dof = j.at("dof").get<int>();
  f.residual_sd = j.at("residual_sd_g").get<double>();
  f.r_squared = j.at("r_squared").get<double>();
  f.rmse = j.at("rmse_g").get<double>();
  f.sse = j.at("sse").get<double>();
  f.x_min = j.at("x_min_g").get<double>();
  f.x_max = j.at("x_max_g").get<double>();
  f.residuals = j.at("residuals_g").get<std::vector<double>>();
  f.xtx_inverse = j.at("xtx_inverse").get<std::vector<double>>();
  return f;
}

checks::RangeApproximation range_approximation_of(const json& set) {
  std::vector<checks::ApproximationPoint> points;
  const json loads = set.value("loads", json::array());
  points.reserve(loads.size());
  for (const auto& l : loads)
    points.push_back({l.at("indication_g").get<double>(), l.at("error_g").get<double>(), l.at("u_c_g").get<double>(),
                      l.at("k").get<double>()});
  return checks::approximate_over_range(points,
                                        parse_model(set.at("fit").at("model").get<std::string>(), "stored model"));
}

json to_json(const checks::RangeApproximation& a) {
  return {{"form", a.form()},
          {"model", std::string(model_key(a.error_fit.model))},
          {"error_coef", a.error_fit.coef},
          {"error_coef_se", a.error_fit.coef_se},
          {"error_formula", a.error_formula()},
          {"error_residual_sd_g", a.error_fit.residual_sd},
          {"alpha_g", a.alpha_g},
          {"beta", a.beta},
          {"envelope_raise_g2", a.envelope_raise_g2},
          {"uncertainty_formula", a.uncertainty_formula()},
          {"k", a.k},
          {"reading_min_g", a.reading_min_g},
          {"reading_max_g", a.reading_max_g},
          {"statement",
           fmt::format("EURAMET cg-18 v4.0 approximation over the range {:.6g} g to {:.6g} g of the reading R: the "
                       "error of indication as a {} fitted by least squares to the errors at the calibrated loads, "
                       "{}; its standard uncertainty {}, fitted to u(E) and the approximation's residual at each load "
                       "and covering both at every load; U = k u with k = {:.2f}, the largest k of the loads. Not "
                       "valid outside the range.",
                       a.reading_min_g, a.reading_max_g, a.form(), a.error_formula(), a.uncertainty_formula(), a.k)}};
}

json to_json(const checks::CalibrationResult& r) {
  json air;
  if (r.air)
    air = {{"formula", std::string(density::to_string(r.air->formula))},
           {"rho_kg_m3", r.air->rho},
           {"u_kg_m3", r.air->u},
           {"u_formula_kg_m3", r.air->u_formula},
           {"u_conditions_kg_m3", r.air->u_conditions},
           {"notes", r.air->notes}};
  return {{"air", air},
          {"decision_rule", std::string(checks::to_string(r.rule))},
          {"decision_rule_key", std::string(checks::key(r.rule))},
          {"rule_statement", r.rule_statement},
          {"tolerance_name", r.tolerance_name},
          {"as_found", set_json(r.as_found)},
          {"as_left", r.as_left ? set_json(*r.as_left) : json()},
          {"notes", r.notes}};
}

}  // namespace plumb::report
