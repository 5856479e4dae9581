#include "store/instrument_versions.hpp"

#include <SQLiteCpp/Statement.h>
#include <fmt/format.h>

#include "store/columns.hpp"

namespace plumb::store {
namespace {

std::optional<TolerancePolicy::Kind> policy_kind(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return c.getString() == "lab" ? TolerancePolicy::Kind::lab : TolerancePolicy::Kind::usp41;
}

/// The registration set: instruments, balances (if a balance) and the identity given then.
constexpr const char* registered_sql =
    "SELECT i.location, i.check_every, i.created_on, i.created_at, i.created_by, b.policy, b.smallest_net_g, "
    "b.max_bias_g, b.max_sd_g, coalesce(n.maker, ''), coalesce(n.model, ''), coalesce(n.serial_no, ''), "
    "coalesce(n.asset_tag, '') FROM instruments i LEFT JOIN balances b ON b.instrument_id = i.id "
    "LEFT JOIN instrument_identities n ON n.instrument_id = i.id WHERE i.id = ?";

constexpr const char* versions_sql =
    "SELECT id, maker, model, serial_no, asset_tag, location, check_every, policy, smallest_net_g, max_bias_g, "
    "max_sd_g, min_readings, effective_on, reason, created_at, created_by FROM instrument_versions "
    "WHERE instrument_id = ? ORDER BY effective_on, id";

}  // namespace

void add_instrument_identity(Recorder& rec, const std::string& instrument_id, const InstrumentIdentity& identity) {
  rec.insert("instrument_identities",
             {{"instrument_id", instrument_id},
              {"maker", identity.maker},
              {"model", identity.model},
              {"serial_no", identity.serial_no},
              {"asset_tag", identity.asset_tag}},
             {"instrument_id"});
}

std::int64_t add_instrument_version(Recorder& rec, const std::string& instrument_id, const InstrumentAttributes& a) {
  const auto& p = a.balance_policy;
  return rec.insert(
      "instrument_versions",
      {{"instrument_id", instrument_id},
       {"maker", a.identity.maker},
       {"model", a.identity.model},
       {"serial_no", a.identity.serial_no},
       {"asset_tag", a.identity.asset_tag},
       {"location", a.location},
       {"check_every", a.every.to_string()},
       {"policy", p ? Value(p->tolerance.key()) : Value()},
       {"smallest_net_g", p ? grams_value(p->smallest_net) : Value()},
       {"max_bias_g", p ? grams_value(p->tolerance.max_bias) : Value()},
       {"max_sd_g", p ? grams_value(p->tolerance.max_sd) : Value()},
       {"min_readings", p && p->tolerance.min_readings ? Value(static_cast<std::int64_t>(*p->tolerance.min_readings))
                                                       : Value()},
       {"effective_on", to_string(a.effective_on)},
       {"reason", a.reason},
       {"created_at", rec.now()},
       {"created_by", rec.actor().name}},
      {"id"}, a.reason);
}

std::vector<InstrumentAttributes> attribute_history(SQLite::Database& db, const std::string& instrument_id) {
  std::vector<InstrumentAttributes> out;
  SQLite::Statement r(db, registered_sql);
  r.bind(1, instrument_id);
  if (!r.executeStep()) return out;
  InstrumentAttributes first;
  first.location = r.getColumn(0).getString();
  first.every = Interval::parse(r.getColumn(1).getString());
  first.effective_on = stored_date(r.getColumn(2));
  first.recorded_at = r.getColumn(3).getString();
  first.recorded_by = r.getColumn(4).getString();
  first.reason = "registered";
  if (const auto kind = policy_kind(r.getColumn(5))) {
    BalancePolicy p;
    p.tolerance.kind = *kind;
    p.smallest_net = stored_grams_or_none(r.getColumn(6));
    p.tolerance.max_bias = stored_grams_or_none(r.getColumn(7));
    p.tolerance.max_sd = stored_grams_or_none(r.getColumn(8));
    first.balance_policy = p;
  }
  first.identity = {r.getColumn(9).getString(), r.getColumn(10).getString(), r.getColumn(11).getString(),
                    r.getColumn(12).getString()};
  out.push_back(std::move(first));

  SQLite::Statement v(db, versions_sql);
  v.bind(1, instrument_id);
  while (v.executeStep()) {
    InstrumentAttributes a;
    a.version_id = v.getColumn(0).getInt64();
    a.identity = {v.getColumn(1).getString(), v.getColumn(2).getString(), v.getColumn(3).getString(),
                  v.getColumn(4).getString()};
    a.location = v.getColumn(5).getString();
    a.every = Interval::parse(v.getColumn(6).getString());
    if (const auto kind = policy_kind(v.getColumn(7))) {
      BalancePolicy p;
      p.tolerance.kind = *kind;
      p.smallest_net = stored_grams_or_none(v.getColumn(8));
      p.tolerance.max_bias = stored_grams_or_none(v.getColumn(9));
      p.tolerance.max_sd = stored_grams_or_none(v.getColumn(10));
      if (!v.getColumn(11).isNull()) p.tolerance.min_readings = v.getColumn(11).getInt();
      a.balance_policy = p;
    }
    a.effective_on = stored_date(v.getColumn(12));
    a.reason = v.getColumn(13).getString();
    a.recorded_at = v.getColumn(14).getString();
    a.recorded_by = v.getColumn(15).getString();
    out.push_back(std::move(a));
  }
  return out;
}

std::optional<InstrumentAttributes> attributes_on(SQLite::Database& db, const std::string& instrument_id, Date on) {
  auto history = attribute_history(db, instrument_id);
  if (history.empty()) return std::nullopt;
  std::size_t in_force = 0;
  for (std::size_t i = 1; i < history.size(); ++i)
    if (history[i].effective_on <= on) in_force = i;
  return history[in_force];
}

std::string version_join(const std::string& alias, const std::string& instrument_column, int param) {
  return fmt::format(
      " LEFT JOIN instrument_versions {0} ON {0}.id = (SELECT x.id FROM instrument_versions x WHERE x.instrument_id "
      "= {1} AND x.effective_on <= ?{2} ORDER BY x.effective_on DESC, x.id DESC LIMIT 1)",
      alias, instrument_column, param);
}

}  // namespace plumb::store
