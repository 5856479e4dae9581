#include "report/check_json.hpp"

namespace plumb::report {

using nlohmann::json;

nlohmann::json criteria_json(const std::vector<Criterion>& criteria) {
  json out = json::array();
  for (const auto& c : criteria)
    out.push_back({{"name", c.name},
                   {"quantity", c.quantity},
                   {"measured_g", c.measured.g},
                   {"limit_g", c.limit.g},
                   {"basis", c.basis},
                   {"pass", c.pass}});
  return out;
}

nlohmann::json to_json(const checks::RepeatabilityResult& r) {
  json j = {{"n", r.n},
            {"mean_g", r.mean.g},
            {"sd_g", r.sd.g},
            {"reference_g", r.reference.g},
            {"bias_g", r.bias.g},
            {"bias_pct", r.bias_pct},
            {"readability_g", r.readability.g},
            {"sd_over_d", r.sd_over_d},
            {"sd_used_g", r.sd_used.g},
            {"min_weight_g", r.min_weight.g},
            {"digit_backed", r.digit_backed},
            {"effective_resolution_g", r.effective_resolution.g},
            {"readability_statement", r.readability_statement},
            {"bias_limit_g", r.bias_limit ? json(r.bias_limit->g) : json()},
            {"sd_limit_g", r.sd_limit ? json(r.sd_limit->g) : json()},
            {"weight_suitable", r.weight_suitable},
            {"verdict", std::string(to_string(r.verdict))},
            {"reasons", r.reasons},
            {"criteria", criteria_json(r.criteria)},
            {"notes", r.notes}};
  return j;
}

nlohmann::json run_json(const store::RunRecord& run) {
  json j = run.results;
  j["run_id"] = run.id;
  j["instrument"] = run.instrument_id;
  j["procedure"] = run.procedure;
  j["date"] = to_string(run.performed_on);
  j["operator"] = run.operator_name;
  j["recorded_at"] = run.recorded_at;
  j["verdict"] = std::string(to_string(run.verdict));
  j["next_due"] = run.next_due ? json(to_string(*run.next_due)) : json();
  j["status"] = run.verdict == Verdict::pass ? "in service" : "out of service";
  j["supersedes"] = run.supersedes ? json(*run.supersedes) : json();
  j["correction_reason"] = run.reason.empty() ? json() : json(run.reason);
  j["superseded_by"] = run.superseded_by ? json(*run.superseded_by) : json();
  json weights = json::array();
  for (const auto& w : run.weights) weights.push_back(w.weight_id);
  j["weights"] = weights;
  json readings = json::array();
  for (const auto& r : run.readings)
    readings.push_back({{"seq", r.seq}, {"series", r.series}, {"text", r.reading.text},
                        {"unit", std::string(to_string(r.reading.unit))}});
  j["readings"] = readings;
  return j;
}

}  // namespace plumb::report
