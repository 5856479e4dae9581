#include "app/calibration/certificate_content.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "report/calibration/json.hpp"
#include "report/calibration/text.hpp"

namespace plumb::app {
namespace {

using nlohmann::json;

json error_table(const json& set) {
  json rows = json::array();
  for (const auto& l : set.value("loads", json::array()))
    rows.push_back({{"index", l["index"]},
                    {"load", l["combination"]},
                    {"nominal_g", l["nominal_g"]},
                    {"reference_g", l["reference_g"]},
                    {"indication_g", l["indication_g"]},
                    {"error_g", l["error_g"]},
                    {"hysteresis_g", l["hysteresis_g"]},
                    {"u_c_g", l["u_c_g"]},
                    {"nu_eff", l["nu_eff"]},
                    {"k", l["k"]},
                    {"U_g", l["U_g"]},
                    {"tolerance_g", l["tolerance_g"]},
                    {"tolerance_basis", l["tolerance_basis"]},
                    {"conformity", l["state"]},
                    {"conformity_key", l["state_key"]},
                    {"explanation", l["explanation"]},
                    {"budget", l["budget"]["lines"]}});
  return rows;
}

json stage_json(const json& set, const char* key, const char* title) {
  json fit = set["fit"];
  fit.erase("xtx_inverse");
  return {{"stage", key},
          {"title", title},
          {"state", set["overall"]},
          {"state_key", set["overall_key"]},
          {"repeatability", set["repeatability"]},
          {"eccentricity", set["eccentricity"]},
          {"error_of_indication", error_table(set)},
          {"fit", fit},
          {"range_approximation", report::to_json(report::range_approximation_of(set))},
          {"max_abs_error_g", set["max_abs_error_g"]},
          {"max_abs_hysteresis_g", set["max_abs_hysteresis_g"]},
          {"weights_suitable", set["weights_suitable"]},
          {"notes", set["notes"]}};
}

}  // namespace

void add_calibration_content(const store::RunRecord& run, json& content) {
  const json& r = run.results;
  json stages = json::array();
  stages.push_back(stage_json(r["as_found"], "as-found", "As found"));
  if (r.contains("as_left") && !r["as_left"].is_null())
    stages.push_back(stage_json(r["as_left"], "as-left", "As left (after adjustment)"));
  double k_min = 1e9, k_max = 0;
  for (const auto& s : stages)
    for (const auto& row : s["error_of_indication"]) {
      k_min = std::min(k_min, row["k"].get<double>());
      k_max = std::max(k_max, row["k"].get<double>());
    }
  const std::string k_text = k_max - k_min < 0.005 ? fmt::format("{:.2f}", k_min)
                                                   : fmt::format("{:.2f} to {:.2f} (given per load)", k_min, k_max);
  const std::string rule_key = r.value("decision_rule_key", "simple");
  content["weights"] = r["weights_used"];
  content["decision_rule"] = r["decision_rule"];
  content["uncertainty_statement"] = fmt::format(
      "The expanded uncertainty U = k u_c is given for the error of indication at each load, with u_c the combined "
      "standard uncertainty (GUM, EURAMET cg-18) and k = {} from Student's t at the effective degrees of freedom "
      "(Welch-Satterthwaite) for a coverage probability of about 95 %.",
      k_text);
  content["calibration"] = {
      {"procedure", "EURAMET cg-18: repeatability, eccentricity, error of indication"},
      {"settings", r["settings"]},
      {"environment", r["environment"]},
      {"air", r["air"]},
      {"model", r["model"]},
      {"tolerance", r["policy_name"]},
      {"decision_rule",
       {{"name", r["decision_rule"]},
        {"key", rule_key},
        {"statement", r["rule_statement"]},
        {"state_meanings", report::conformity_state_meanings(rule_key)}}},
      {"stages", stages},
      {"adjusted", r.value("adjusted", false)},
      {"final_stage", r["final_stage"]},
      {"final_state", r["final_state"]},
      {"readability_g", r["readability_g"]},
      {"capacity_g", r["capacity_g"]},
      {"notes", r["notes"]}};
  // "status" is the certificate's own standing when it is shown (app/certificates/review.hpp), so the instrument's
  // service status after the calibration has its own key.
  content["service_status"] = run.verdict == Verdict::pass ? "in service" : "out of service";
}

}  // namespace plumb::app
