#include "store/pipettes.hpp"

#include <SQLiteCpp/Statement.h>
#include <fmt/format.h>

#include "store/instrument_versions.hpp"
#include "store/repository.hpp"

namespace plumb::store {
namespace {

using nlohmann::json;

Decimal trimmed(Decimal v) { return v.rescaled(v.significant_scale()); }

Value text_or_null(const std::optional<Decimal>& d) { return d ? Value(trimmed(*d).to_string()) : Value(); }

std::optional<Decimal> decimal_or_none(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return Decimal::parse(c.getString(), c.getName());
}

/// A volume column holds exact decimal text in microlitres.
std::optional<ExactVolume> volume_or_none(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return ExactVolume::microlitres(Decimal::parse(c.getString(), c.getName()));
}

pipette_limits::LimitsPolicy::Kind policy_kind(const std::string& key) {
  if (key == "lab-ul") return pipette_limits::LimitsPolicy::Kind::lab_ul;
  if (key == "lab-pct") return pipette_limits::LimitsPolicy::Kind::lab_pct;
  return pipette_limits::LimitsPolicy::Kind::iso8655_2;
}

// A pipette with the attributes in force on the date bound to ?1 (schema/006_lifecycle.sql).
const std::string& pipette_select() {
  static const std::string sql =
      "SELECT i.id, CASE WHEN v.id IS NULL THEN i.location ELSE v.location END, coalesce(v.check_every, "
      "i.check_every), i.created_on, p.volume_kind, p.nominal_ul, p.lower_limit_ul, p.channels, p.limits_policy, "
      "p.max_systematic, p.max_random, coalesce(v.maker, n.maker, ''), coalesce(v.model, n.model, ''), "
      "coalesce(v.serial_no, n.serial_no, ''), coalesce(v.asset_tag, n.asset_tag, '') FROM instruments i "
      "JOIN pipettes p ON p.instrument_id = i.id LEFT JOIN instrument_identities n ON n.instrument_id = i.id" +
      version_join("v", "i.id", 1);
  return sql;
}

PipetteRecord pipette_from(SQLite::Statement& q) {
  PipetteRecord p;
  checks::PipetteDefinition& d = p.definition;
  d.id = q.getColumn(0).getString();
  p.location = q.getColumn(1).getString();
  p.every = Interval::parse(q.getColumn(2).getString());
  p.created_on = parse_date(q.getColumn(3).getString());
  d.kind = q.getColumn(4).getString() == "variable" ? checks::PipetteKind::variable : checks::PipetteKind::fixed;
  d.nominal = ExactVolume::microlitres(Decimal::parse(q.getColumn(5).getString()));
  d.lower_limit = volume_or_none(q.getColumn(6));
  d.channels = q.getColumn(7).getInt();
  d.limits.kind = policy_kind(q.getColumn(8).getString());
  d.limits.systematic = decimal_or_none(q.getColumn(9));
  d.limits.random = decimal_or_none(q.getColumn(10));
  p.identity = {q.getColumn(11).getString(), q.getColumn(12).getString(), q.getColumn(13).getString(),
                q.getColumn(14).getString()};
  return p;
}

}  // namespace

std::string pipette_series(ExactVolume volume, int channel) {
  return fmt::format("{} uL channel {}", volume.ul_text(), channel);
}

void add_pipette(Recorder& rec, const PipetteRecord& p) {
  const checks::PipetteDefinition& d = p.definition;
  rec.insert("instruments",
             {{"id", d.id},
              {"kind", "pipette"},
              {"location", p.location},
              {"check_every", p.every.to_string()},
              {"created_on", to_string(p.created_on)},
              {"created_at", rec.now()},
              {"created_by", rec.actor().name}},
             {"id"});
  const bool lab = d.limits.kind != pipette_limits::LimitsPolicy::Kind::iso8655_2;
  rec.insert("pipettes",
             {{"instrument_id", d.id},
              {"volume_kind", std::string(checks::to_string(d.kind))},
              {"nominal_ul", d.nominal.ul_text()},
              {"lower_limit_ul",
               d.kind == checks::PipetteKind::variable && d.lower_limit ? Value(d.lower_limit->ul_text()) : Value()},
              {"channels", d.channels},
              {"limits_policy", d.limits.key()},
              {"max_systematic", lab ? text_or_null(d.limits.systematic) : Value()},
              {"max_random", lab ? text_or_null(d.limits.random) : Value()}},
             {"instrument_id"});
  if (!p.identity.empty()) add_instrument_identity(rec, d.id, p.identity);
}

std::optional<PipetteRecord> find_pipette(SQLite::Database& db, const std::string& id) {
  SQLite::Statement q(db, pipette_select() + " WHERE i.id = ?2");
  q.bind(1, latest_attributes_date);
  q.bind(2, id);
  if (!q.executeStep()) return std::nullopt;
  return pipette_from(q);
}

std::optional<PipetteRecord> find_pipette_on(SQLite::Database& db, const std::string& id, Date on) {
  SQLite::Statement q(db, pipette_select() + " WHERE i.id = ?2");
  q.bind(1, to_string(on));
  q.bind(2, id);
  if (!q.executeStep()) return std::nullopt;
  return pipette_from(q);
}

std::vector<PipetteRecord> list_pipettes(SQLite::Database& db) {
  SQLite::Statement q(db, pipette_select() + " ORDER BY i.id COLLATE natural_id");
  q.bind(1, latest_attributes_date);
  std::vector<PipetteRecord> out;
  while (q.executeStep()) out.push_back(pipette_from(q));
  return out;
}

void add_pipette_run_conditions(RowGroup& group, const PipetteRunConditions& c) {
  group.insert("pipette_run_conditions",
             {{"run_id", c.run_id},
              {"balance_id", c.balance_id},
              {"balance_run_id", c.balance_run_id},
              {"water_temperature_c", c.water_temperature_c.to_string()},
              {"air_pressure_hpa", c.air_pressure_hpa.to_string()},
              {"humidity_pct", c.humidity_pct.to_string()},
              {"evaporation_g", c.evaporation ? Value(c.evaporation->in_grams().to_string()) : Value()}},
             {"run_id"});
}

std::optional<PipetteRunConditions> find_pipette_run_conditions(SQLite::Database& db, std::int64_t run_id) {
  SQLite::Statement q(db,
                      "SELECT run_id, balance_id, balance_run_id, water_temperature_c, air_pressure_hpa, humidity_pct, "
                      "evaporation_g FROM pipette_run_conditions WHERE run_id = ?");
  q.bind(1, run_id);
  if (!q.executeStep()) return std::nullopt;
  PipetteRunConditions c;
  c.run_id = q.getColumn(0).getInt64();
  c.balance_id = q.getColumn(1).getString();
  c.balance_run_id = q.getColumn(2).getInt64();
  c.water_temperature_c = Decimal::parse(q.getColumn(3).getString());
  c.air_pressure_hpa = Decimal::parse(q.getColumn(4).getString());
  c.humidity_pct = Decimal::parse(q.getColumn(5).getString());
  if (!q.getColumn(6).isNull()) c.evaporation = ExactMass::grams(Decimal::parse(q.getColumn(6).getString()));
  return c;
}

std::optional<RunRecord> latest_run_on_or_before(SQLite::Database& db, const std::string& instrument_id, Date on) {
  SQLite::Statement q(db,
                      "SELECT id FROM check_runs WHERE instrument_id = ?1 AND performed_on <= ?2 AND id NOT IN "
                      "(SELECT supersedes FROM check_runs WHERE supersedes IS NOT NULL) "
                      "AND id NOT IN (SELECT run_id FROM run_voids) ORDER BY performed_on DESC, id DESC LIMIT 1");
  q.bind(1, instrument_id);
  q.bind(2, to_string(on));
  if (!q.executeStep()) return std::nullopt;
  return find_run(db, q.getColumn(0).getInt64());
}

}  // namespace plumb::store
