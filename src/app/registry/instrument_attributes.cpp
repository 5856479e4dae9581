#include "app/registry/instrument_attributes.hpp"

#include <SQLiteCpp/Statement.h>
#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include <charconv>

#include "app/registry/fields.hpp"
#include "app/registry/lab.hpp"
#include "core/errors.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

std::string instrument_kind(store::Database& db, const std::string& id) {
  SQLite::Statement q(db.sql(), "SELECT kind FROM instruments WHERE id = ?");
  q.bind(1, id);
  if (!q.executeStep()) throw InputError(fmt::format("instrument \"{}\" is not registered.", id));
  return q.getColumn(0).getString();
}

/// The last check of the instrument that counts (not void), if any.
std::optional<Date> last_check_date(store::Database& db, const std::string& id) {
  SQLite::Statement q(db.sql(),
                      "SELECT max(performed_on) FROM check_runs r WHERE r.instrument_id = ? AND NOT EXISTS "
                      "(SELECT 1 FROM run_voids v WHERE v.run_id = r.id)");
  q.bind(1, id);
  if (!q.executeStep() || q.getColumn(0).isNull()) return std::nullopt;
  return parse_date(q.getColumn(0).getString());
}

int parse_min_readings(const std::string& text) {
  int n = 0;
  const auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), n);
  if (ec != std::errc{} || end != text.data() + text.size() || n < 2 || n > 100)
    throw InputError(fmt::format("--min-readings \"{}\" must be a whole number from 2 to 100.", text));
  return n;
}

std::string text_or_dash(const std::string& s) {
  return s.empty() ? "-" : s;
}

std::string policy_text(const store::BalancePolicy& p) {
  std::string s = p.tolerance.name();
  if (p.smallest_net) s += ", smallest net " + p.smallest_net->to_string();
  if (p.tolerance.max_bias) s += ", |bias| <= " + p.tolerance.max_bias->to_string();
  if (p.tolerance.max_sd) s += ", s <= " + p.tolerance.max_sd->to_string();
  if (p.tolerance.min_readings) s += fmt::format(", at least {} readings", *p.tolerance.min_readings);
  return s;
}

void apply_policy(const AttributeChangeInput& in, const store::BalanceRecord& balance, store::BalancePolicy& p) {
  if (in.policy) {
    if (*in.policy == "usp41") {
      p.tolerance.kind = TolerancePolicy::Kind::usp41;
      p.tolerance.max_bias.reset();
      p.tolerance.max_sd.reset();
      p.tolerance.min_readings.reset();
    } else if (*in.policy == "lab") {
      p.tolerance.kind = TolerancePolicy::Kind::lab;
    } else {
      throw InputError(fmt::format("--policy \"{}\" must be usp41 or lab.", *in.policy));
    }
  }
  if (in.smallest_net) {
    p.smallest_net = positive_mass(*in.smallest_net, "--smallest-net");
    if (*p.smallest_net > balance.capacity)
      throw InputError(fmt::format("--smallest-net {} exceeds the capacity {} of balance {}.", *in.smallest_net,
                                   balance.capacity.to_string(), balance.id));
  }
  const bool lab_fields = in.max_bias || in.max_sd || in.min_readings;
  if (lab_fields && p.tolerance.kind != TolerancePolicy::Kind::lab) {
    if (in.policy) throw InputError("--max-bias, --max-sd and --min-readings belong to --policy lab, not usp41.");
    p.tolerance.kind = TolerancePolicy::Kind::lab;  // the lab's own limits replace USP <41>, as at registration
  }
  if (in.max_bias) p.tolerance.max_bias = positive_mass(*in.max_bias, "--max-bias");
  if (in.max_sd) p.tolerance.max_sd = positive_mass(*in.max_sd, "--max-sd");
  if (in.min_readings) p.tolerance.min_readings = parse_min_readings(*in.min_readings);
  if (p.tolerance.kind == TolerancePolicy::Kind::usp41 && !p.smallest_net)
    throw InputError("--smallest-net is required for the USP <41> policy.");
  if (p.tolerance.kind == TolerancePolicy::Kind::lab && !p.tolerance.max_bias && !p.tolerance.max_sd)
    throw InputError("the lab policy needs --max-bias or --max-sd (or both).");
}

void set_if(const std::optional<std::string>& typed, std::string& field) {
  if (typed) field = *typed;
}

}  // namespace

store::InstrumentIdentity read_identity(const IdentityInput& in) {
  store::InstrumentIdentity id;
  const auto take = [](const std::optional<std::string>& typed, std::string_view field, std::string& out) {
    if (!typed) return;
    if (typed->size() > 200) throw InputError(fmt::format("{} is longer than 200 characters.", field));
    out = *typed;
  };
  take(in.maker, "--maker", id.maker);
  take(in.model, "--model", id.model);
  take(in.serial, "--serial", id.serial_no);
  take(in.asset_tag, "--asset-tag", id.asset_tag);
  return id;
}

std::string describe_change(const store::InstrumentAttributes& before, const store::InstrumentAttributes& after) {
  std::string out;
  const auto note = [&](std::string_view what, const std::string& a, const std::string& b) {
    if (a == b) return;
    out += fmt::format("{}{} {} -> {}", out.empty() ? "" : "; ", what, text_or_dash(a), text_or_dash(b));
  };
  note("maker", before.identity.maker, after.identity.maker);
  note("model", before.identity.model, after.identity.model);
  note("serial", before.identity.serial_no, after.identity.serial_no);
  note("asset tag", before.identity.asset_tag, after.identity.asset_tag);
  note("location", before.location, after.location);
  note("interval", before.every.to_string(), after.every.to_string());
  if (before.balance_policy && after.balance_policy)
    note("policy", policy_text(*before.balance_policy), policy_text(*after.balance_policy));
  return out;
}

AttributeChange change_attributes(store::Database& db, const store::Actor& actor, const AttributeChangeInput& in) {
  if (in.reason.empty()) throw InputError("--reason must say why the attributes change.");
  const Date on = in.from ? parse_date(*in.from, "--from") : today_local();
  if (on > today_local())
    throw InputError(fmt::format("--from {} is in the future; record a change when it has happened.", *in.from));

  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  require_lab(db);
  AttributeChange c;
  c.kind = instrument_kind(db, in.id);
  const auto history = store::attribute_history(db.sql(), in.id);
  c.before = history.back();
  if (on < history.front().effective_on)
    throw InputError(fmt::format("--from {} is before {} was registered ({}).", to_string(on), in.id,
                                 to_string(history.front().effective_on)));
  if (history.size() > 1 && on < history.back().effective_on)
    throw InputError(fmt::format("--from {} is before the last change of {} (from {}); changes are recorded in order.",
                                 to_string(on), in.id, to_string(history.back().effective_on)));
  if (const auto last = last_check_date(db, in.id); last && on <= *last)
    throw InputError(
        fmt::format("--from {} is on or before the last check of {} ({}), whose records state the "
                    "attributes in force then; date the change after it.",
                    to_string(on), in.id, to_string(*last)));

  c.after = c.before;
  c.after.version_id = 0;
  const store::InstrumentIdentity typed = read_identity(in.identity);
  if (in.identity.maker) c.after.identity.maker = typed.maker;
  if (in.identity.model) c.after.identity.model = typed.model;
  if (in.identity.serial) c.after.identity.serial_no = typed.serial_no;
  if (in.identity.asset_tag) c.after.identity.asset_tag = typed.asset_tag;
  set_if(in.location, c.after.location);
  if (in.every) c.after.every = Interval::parse(*in.every, "--every");
  const bool balance_fields = in.policy || in.smallest_net || in.max_bias || in.max_sd || in.min_readings;
  if (c.kind == "balance") {
    const auto balance = store::find_balance(db.sql(), in.id);
    apply_policy(in, *balance, *c.after.balance_policy);
  } else if (balance_fields) {
    throw InputError(
        fmt::format("{} is a {}: --policy, --smallest-net, --max-bias, --max-sd and --min-readings "
                    "belong to balances.",
                    in.id, c.kind));
  }
  if (describe_change(c.before, c.after).empty())
    throw InputError(fmt::format("nothing to change: the attributes given are those of {} already.", in.id));
  c.after.effective_on = on;
  c.after.reason = in.reason;
  store::Recorder rec(db.sql(), actor);
  c.after.version_id = store::add_instrument_version(rec, in.id, c.after);
  c.after.recorded_at = rec.now();
  c.after.recorded_by = actor.name;
  rec.commit(tx);
  return c;
}

}  // namespace plumb::app
