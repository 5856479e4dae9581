#include "app/pipette/certificate_content.hpp"

#include "app/certificates/issue.hpp"

#include "app/pipette/registry.hpp"
#include "checks/pipette_edition.hpp"
#include "store/pipettes.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

using nlohmann::json;

constexpr const char* pipette_caution =
    "Pipettes checked here may dispense for clinical, pharmaceutical or food work: this check verifies volume "
    "against the stated limits under the stated conditions only. It does not replace the manufacturer's "
    "instructions, an accredited calibration where one is required, or local regulations and licensed practice.";

}  // namespace

void add_pipette_certificate_parts(store::Database& db, const store::RunRecord& run, json& content) {
  if (const auto p = store::find_pipette_on(db.sql(), run.instrument_id, run.performed_on)) {
    const auto& d = p->definition;
    content["instrument"] = {{"id", d.id},
                             {"kind", "pipette"},
                             {"maker", p->identity.maker},
                             {"model", p->identity.model},
                             {"serial", p->identity.serial_no},
                             {"asset_tag", p->identity.asset_tag},
                             {"volume_kind", std::string(checks::to_string(d.kind))},
                             {"location", p->location},
                             {"nominal_ul", d.nominal.ul_text()},
                             {"lower_limit_ul", d.lower_limit ? json(d.lower_limit->ul_text()) : json()},
                             {"channels", d.channels},
                             {"check_every", p->every.to_string()},
                             {"limits_policy", d.limits.key()},
                             {"limits", limits_summary(d.limits)},
                             {"limits_source", d.limits.kind == pipette_limits::LimitsPolicy::Kind::iso8655_2
                                                   ? "ISO 8655-2:2002 Table 1"
                                                   : "the laboratory's own limits"}};
    // Runs recorded before the edition was a choice were checked to 2002.
    const json& ed = run.results.value("edition", json());
    content["edition"] = ed.is_object() ? ed["edition"] : json("2002");
    content["edition_statement"] =
        ed.is_object() ? ed["statement"] : json(checks::edition_statement(checks::Iso8655Edition::e2002, d));
  }
  json balance_used = json::object();
  json weights = json::array();
  if (const auto cond = store::find_pipette_run_conditions(db.sql(), run.id)) {
    balance_used["id"] = cond->balance_id;
    if (const auto b = store::find_balance_on(db.sql(), cond->balance_id, run.performed_on)) {
      balance_used["location"] = b->location;
      balance_used["capacity_g"] = b->capacity.in_grams().to_string();
      balance_used["readability_g"] = b->readability.in_grams().to_string();
    }
    if (const auto br = store::find_run(db.sql(), cond->balance_run_id)) {
      balance_used["check_run"] = br->id;
      balance_used["check_procedure"] = std::string(checks::to_string(br->procedure));
      balance_used["checked_on"] = to_string(br->performed_on);
      balance_used["check_verdict"] = std::string(to_string(br->verdict));
      balance_used["due_on"] = br->next_due ? json(to_string(*br->next_due)) : json();
      const auto cert = store::certificate_for_run(db.sql(), br->id);
      balance_used["check_certificate"] = cert ? json(cert->number) : json();
      for (const auto& rw : br->weights) {
        const auto w = store::find_weight(db.sql(), rw.weight_id);
        const auto c = store::find_weight_calibration(db.sql(), rw.weight_calibration_id);
        if (w && c) weights.push_back(weight_traceability_json(*w, *c));
      }
    }
  }
  // The balance calibration whose U(E) stands for the balance in the uncertainty budget, or why none does.
  const json& stated = run.results.value("balance", json::object());
  for (const char* key : {"calibration_run", "calibration_certificate", "calibration_absent"})
    if (stated.contains(key)) balance_used[key] = stated[key];
  content["balance_used"] = balance_used;
  content["weights"] = weights;  // the reference weights behind the balance's check: the traceability chain
  const std::string caution = content.value("caution", "");
  content["caution"] = caution.empty() ? std::string(pipette_caution) : caution + " " + pipette_caution;
}

}  // namespace plumb::app
