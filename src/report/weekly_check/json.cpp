#include "report/weekly_check/json.hpp"

#include "report/format/json_text.hpp"
#include "report/runs/json.hpp"

namespace plumb::report {

using nlohmann::json;

nlohmann::json to_json(const checks::RepeatabilityResult& r) {
  json j = json::object();
  j["n"] = r.n;
  j["required_readings"] = r.required_readings;
  j["readings_basis"] = r.readings_basis;
  j["mean_g"] = r.mean.g();
  j["sd_g"] = r.sd.g();
  j["reference_g"] = r.reference.g();
  j["bias_g"] = r.bias.g();
  j["bias_pct"] = r.bias_pct;
  j["bias_expanded_u_g"] = r.bias_expanded_u.g();
  j["sd_expanded_u_g"] = r.sd_expanded_u.g();
  j["uncertainty_k"] = r.uncertainty_k;
  j["readability_g"] = r.readability.g();
  j["sd_over_d"] = r.sd_over_d;
  j["sd_used_g"] = r.sd_used.g();
  j["min_weight_g"] = r.min_weight.g();
  j["digit_backed"] = r.digit_backed;
  j["effective_resolution_g"] = r.effective_resolution.g();
  j["readability_statement"] = r.readability_statement;
  j["bias_limit_g"] = r.bias_limit ? json(r.bias_limit->g()) : json();
  j["sd_limit_g"] = r.sd_limit ? json(r.sd_limit->g()) : json();
  j["weight_suitable"] = r.weight_suitable;
  j["verdict"] = std::string(to_string(r.verdict));
  j["reasons"] = r.reasons;
  j["criteria"] = criteria_json(r.criteria);
  j["notes"] = r.notes;
  return j;
}

std::string repeatability_results_text(const checks::RepeatabilityResult& r, std::string_view policy_key,
                                       std::string_view policy_name) {
  // Members in sorted order, as nlohmann keeps them (tests/unit/check_json_test.cpp compares the two).
  std::string out;
  out.reserve(1024);
  JsonText j(out);
  j.object();
  j.key("bias_expanded_u_g").value(r.bias_expanded_u.g());
  j.key("bias_g").value(r.bias.g());
  j.key("bias_limit_g");
  r.bias_limit ? j.value(r.bias_limit->g()) : j.null();
  j.key("bias_pct").value(r.bias_pct);
  j.key("criteria").array();
  for (const auto& c : r.criteria) {
    j.object();
    j.key("basis").value(c.basis);
    j.key("limit_g").value(c.limit.g());
    j.key("measured_g").value(c.measured.g());
    j.key("name").value(c.name);
    j.key("pass").value(c.pass);
    j.key("quantity").value(c.quantity);
    j.end();
  }
  j.end();
  j.key("digit_backed").value(r.digit_backed);
  j.key("effective_resolution_g").value(r.effective_resolution.g());
  j.key("mean_g").value(r.mean.g());
  j.key("min_weight_g").value(r.min_weight.g());
  j.key("n").value(r.n);
  j.key("notes").strings(r.notes);
  j.key("policy").value(policy_key);
  j.key("policy_name").value(policy_name);
  j.key("readability_g").value(r.readability.g());
  j.key("readability_statement").value(r.readability_statement);
  j.key("readings_basis").value(r.readings_basis);
  j.key("reasons").strings(r.reasons);
  j.key("reference_g").value(r.reference.g());
  j.key("required_readings").value(static_cast<long long>(r.required_readings));
  j.key("sd_expanded_u_g").value(r.sd_expanded_u.g());
  j.key("sd_g").value(r.sd.g());
  j.key("sd_limit_g");
  r.sd_limit ? j.value(r.sd_limit->g()) : j.null();
  j.key("sd_over_d").value(r.sd_over_d);
  j.key("sd_used_g").value(r.sd_used.g());
  j.key("uncertainty_k").value(r.uncertainty_k);
  j.key("verdict").value(to_string(r.verdict));
  j.key("weight_suitable").value(r.weight_suitable);
  j.end();
  return out;
}

}  // namespace plumb::report
