#include "app/registry/instrument_page.hpp"

#include <SQLiteCpp/Statement.h>
#include <fmt/format.h>

#include "app/certificates/review.hpp"
#include "app/pipette/registry.hpp"
#include "app/registry/in_use.hpp"
#include "app/registry/instrument_attributes.hpp"
#include "app/status/due.hpp"
#include "core/errors.hpp"
#include "store/instrument_versions.hpp"
#include "store/pipettes.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

using nlohmann::json;

json identity_json(const store::InstrumentIdentity& i) {
  return {{"maker", i.maker}, {"model", i.model}, {"serial", i.serial_no}, {"asset_tag", i.asset_tag}};
}

json policy_json(const std::optional<store::BalancePolicy>& p) {
  if (!p) return nullptr;
  const auto grams = [](const std::optional<ExactMass>& m) { return m ? json(m->to_string()) : json(); };
  return {{"policy", p->tolerance.key()},
          {"policy_name", p->tolerance.name()},
          {"smallest_net", grams(p->smallest_net)},
          {"max_bias", grams(p->tolerance.max_bias)},
          {"max_sd", grams(p->tolerance.max_sd)},
          {"min_readings", p->tolerance.required_readings()},
          {"min_readings_basis", p->tolerance.readings_basis()}};
}

json versions_json(const std::vector<store::InstrumentAttributes>& history) {
  json out = json::array();
  for (std::size_t i = 0; i < history.size(); ++i) {
    const auto& v = history[i];
    out.push_back({{"from", to_string(v.effective_on)},
                   {"change", i == 0 ? std::string("registered") : describe_change(history[i - 1], v)},
                   {"reason", v.reason},
                   {"recorded_by", v.recorded_by},
                   {"recorded_at", v.recorded_at},
                   {"location", v.location},
                   {"check_every", v.every.to_string()}});
  }
  return out;
}

json runs_json(store::Database& db, const std::string& id) {
  json out = json::array();
  for (const auto& r : store::runs_of(db.sql(), id)) {
    std::string standing = "current";
    if (r.voided)
      standing = "void: " + r.voided->reason;
    else if (r.superseded_by)
      standing = fmt::format("superseded by run {}", *r.superseded_by);
    json cert;
    if (const auto c = store::certificate_for_run(db.sql(), r.id))
      cert = {{"number", c->number}, {"state", certificate_status(db, *c).value("state", "draft")}};
    out.push_back({{"run_id", r.id},
                   {"date", to_string(r.performed_on)},
                   {"procedure", std::string(checks::to_string(r.procedure))},
                   {"operator", r.operator_name},
                   {"verdict", std::string(to_string(r.verdict))},
                   {"standing", standing},
                   {"certificate", cert}});
  }
  return out;
}

/// Of `balance in-use`, what the balance record shows: U(W) in its form, both minimum weights and which binds.
json in_use_summary(const json& full) {
  const json& u = full.value("in_use", json());
  const json& usp = full.value("usp41", json());
  const json& mw = full["minimum_weight"];
  json out = {{"terms_declared", full["terms"].is_object()},
              {"usp41_minimum_weight_g", usp.value("minimum_weight_g", json())},
              {"usp41_run", usp.value("run_id", json())},
              {"binding", mw["binding"]},
              {"statement", mw["statement"]},
              {"caution", mw["caution"]}};
  if (u.is_object()) {
    out["formula"] = u["formula"];
    out["form"] = u["form"];
    out["error_corrected"] = u["error_corrected"];
    out["calibration_minimum_weight_g"] = u["minimum_weight_g"];
    out["calibration_run"] = full["calibration"].value("run_id", json());
  } else if (!full["terms"].is_object()) {
    out["absent"] = "no terms of normal use declared (plumb balance set-in-use)";
  } else {
    out["absent"] = full["calibration"].value("absent", std::string("no calibration to draw on"));
  }
  return out;
}

}  // namespace

json instrument_page(store::Database& db, const std::string& kind, const std::string& id, Date on) {
  json page = {{"id", id}, {"kind", kind}};
  const auto history = store::attribute_history(db.sql(), id);
  if (kind == "balance") {
    const auto b = store::find_balance(db.sql(), id);
    if (!b) throw InputError(fmt::format("balance \"{}\" is not registered.", id));
    page["capacity"] = b->capacity.to_string();
    page["readability"] = b->readability.to_string();
    page["weekly_check"] = policy_json(history.back().balance_policy);
    page["in_use"] = in_use_summary(balance_in_use(db, id, on));
  } else {
    const auto p = store::find_pipette(db.sql(), id);
    if (!p) throw InputError(fmt::format("pipette \"{}\" is not registered.", id));
    const auto& d = p->definition;
    page["volume_kind"] = std::string(checks::to_string(d.kind));
    page["nominal"] = d.nominal.to_string();
    page["lower_limit"] = d.lower_limit ? json(d.lower_limit->to_string()) : json();
    page["channels"] = d.channels;
    page["limits"] = limits_summary(d.limits);
  }
  const auto& now = history.back();
  page["identity"] = identity_json(now.identity);
  page["location"] = now.location;
  page["check_every"] = now.every.to_string();
  page["in_use_since"] = to_string(history.front().effective_on);
  // The same lines and the same standing as `due --all` and `summary`: the line that matters most decides.
  json lines = json::array();
  std::optional<report::DueItem> worst;
  for (const auto& item : instrument_due_items(db, id, on, default_due_window_days, true)) {
    lines.push_back({{"kind", item.kind},
                     {"status", item.status},
                     {"due_on", item.due_on ? json(to_string(*item.due_on)) : json()},
                     {"detail", item.detail}});
    if (!worst || standing_rank(item.status) < standing_rank(worst->status)) worst = item;
  }
  json standing = {{"status", worst ? worst->status : std::string("in date")},
                   {"due_on", worst && worst->due_on ? json(to_string(*worst->due_on)) : json()},
                   {"days_left", worst && worst->days_left ? json(*worst->days_left) : json()},
                   {"lines", lines}};
  page["standing"] = standing;
  page["on"] = to_string(on);
  page["attribute_history"] = versions_json(history);
  page["runs"] = runs_json(db, id);
  return page;
}

}  // namespace plumb::app
