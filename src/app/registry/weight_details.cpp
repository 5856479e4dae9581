#include "app/registry/weight_details.hpp"

#include <fmt/format.h>

#include "app/registry/weight_in_force.hpp"
#include "app/registry/weight_properties.hpp"
#include "app/status/due.hpp"
#include "core/errors.hpp"
#include "store/repository.hpp"
#include "store/status_events.hpp"
#include "store/weight_certificates.hpp"

namespace plumb::app {
namespace {

std::string status_of(const report::WeightDetails& d) {
  if (d.retirement) return "retired";
  if (!d.in_force_id) return "no certificate in force";
  return d.overdue ? "overdue" : "in date";
}

}  // namespace

report::WeightDetails weight_details(store::Database& db, const std::string& id, Date on) {
  report::WeightDetails d;
  auto weight = store::find_weight(db.sql(), id);
  if (!weight) throw InputError(fmt::format("weight \"{}\" is not a known reference weight.", id));
  d.weight = std::move(*weight);
  d.certificates = store::weight_certificates(db.sql(), id);
  d.overrides = store::weight_class_overrides(db.sql(), id);
  d.on = on;
  if (const store::WeightCalibration* c = certificate_in_force(d.certificates, on)) {
    d.in_force_id = c->id;
    d.overdue = overdue_on(*c, on);
  }
  d.retirement = store::retirement(db.sql(), "weight", id);
  d.properties = store::weight_properties_history(db.sql(), id);
  try {
    const WeightDensity density =
        density_for_budget(d.weight, d.properties.empty() ? std::nullopt : std::optional(d.properties.back()));
    d.density_kg_m3 = density.rho_kg_m3;
    d.u_density_kg_m3 = density.u_kg_m3;
    d.density_source = density.source;
  } catch (const InputError&) {
    // Shown, not refused: the weight is listed all the same, and a calibration using it says how to enter it.
    d.density_source = "none entered, and OIML R 111-1:2004 Table 5 sets no limit for its class at this nominal value";
  }
  d.status = status_of(d);
  // The same standing as the due list and every other output (app/status/due.hpp), "due" included.
  if (d.status != "no certificate in force") {
    const auto standing = standings_on(db, on, default_due_window_days);
    if (const auto it = standing.find(standing_key("weight", id)); it != standing.end()) d.status = it->second.status;
  }
  return d;
}

std::map<std::string, std::string> weight_statuses(store::Database& db, Date on) {
  std::map<std::string, std::string> out;
  const auto standing = standings_on(db, on, default_due_window_days);
  for (const auto& w : store::list_weights(db.sql())) {
    const auto it = standing.find(standing_key("weight", w.id));
    out[w.id] = it != standing.end() ? it->second.status : weight_details(db, w.id, on).status;
  }
  return out;
}

}  // namespace plumb::app
