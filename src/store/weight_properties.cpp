#include "store/weight_properties.hpp"

#include <SQLiteCpp/Statement.h>

#include "store/columns.hpp"

namespace plumb::store {

namespace {
std::optional<Decimal> stored_decimal_or_none(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return Decimal::parse(c.getString(), c.getName());
}
}  // namespace

std::vector<WeightProperties> weight_properties_history(SQLite::Database& db, const std::string& weight_id) {
  SQLite::Statement q(db,
                      "SELECT id, density_kg_m3, u_density_kg_m3, density_class, drift_g, by_name, recorded_at "
                      "FROM weight_properties WHERE weight_id = ? ORDER BY id");
  q.bind(1, weight_id);
  std::vector<WeightProperties> out;
  while (q.executeStep()) {
    WeightProperties p;
    p.id = q.getColumn(0).getInt64();
    p.weight_id = weight_id;
    p.density_kg_m3 = stored_decimal_or_none(q.getColumn(1));
    p.u_density_kg_m3 = stored_decimal_or_none(q.getColumn(2));
    if (!q.getColumn(3).isNull()) p.density_class = q.getColumn(3).getString();
    p.drift = stored_grams_or_none(q.getColumn(4));
    p.by_name = q.getColumn(5).getString();
    p.recorded_at = q.getColumn(6).getString();
    out.push_back(std::move(p));
  }
  return out;
}

std::optional<WeightProperties> weight_properties_in_force(SQLite::Database& db, const std::string& weight_id) {
  auto history = weight_properties_history(db, weight_id);
  if (history.empty()) return std::nullopt;
  return history.back();
}

std::int64_t add_weight_properties(Recorder& rec, const WeightProperties& p) {
  const auto text = [](const std::optional<Decimal>& d) { return d ? Value(d->to_string()) : Value(); };
  return rec.insert("weight_properties",
                    {{"weight_id", p.weight_id},
                     {"density_source", p.density_class ? "class" : "entered"},
                     {"density_kg_m3", text(p.density_kg_m3)},
                     {"u_density_kg_m3", text(p.u_density_kg_m3)},
                     {"density_class", p.density_class},
                     {"drift_g", grams_value(p.drift)},
                     {"by_name", rec.actor().name},
                     {"recorded_at", rec.now()},
                     {"os_user", rec.actor().os_user}},
                    {"id"});
}

}  // namespace plumb::store
