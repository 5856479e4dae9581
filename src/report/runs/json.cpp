#include "report/runs/json.hpp"

#include "checks/procedure.hpp"

namespace plumb::report {

using nlohmann::json;

// Built member by member: an initializer list of pairs copies every value once more, and a batch import
// builds this for every run it records.
nlohmann::json criteria_json(const std::vector<Criterion>& criteria) {
  json out = json::array();
  for (const auto& c : criteria) {
    json j = json::object();
    j["name"] = c.name;
    j["quantity"] = c.quantity;
    j["measured_g"] = c.measured.g();
    j["limit_g"] = c.limit.g();
    j["basis"] = c.basis;
    j["pass"] = c.pass;
    out.push_back(std::move(j));
  }
  return out;
}

nlohmann::json run_json(const store::RunRecord& run) {
  json j = run.results;
  j["run_id"] = run.id;
  j["instrument"] = run.instrument_id;
  j["procedure"] = std::string(checks::to_string(run.procedure));
  j["date"] = to_string(run.performed_on);
  j["operator"] = run.operator_name;
  j["recorded_at"] = run.recorded_at;
  j["verdict"] = std::string(to_string(run.verdict));
  j["next_due"] = run.next_due ? json(to_string(*run.next_due)) : json();
  j["status"] = run.voided ? "void" : run.verdict == Verdict::pass ? "in service" : "out of service";
  j["void"] = run.voided ? json{{"reason", run.voided->reason}, {"by", run.voided->by_name}, {"at", run.voided->recorded_at}}
                         : json();
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
