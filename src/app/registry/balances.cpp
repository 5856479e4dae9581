#include "app/registry/balances.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include "app/registry/fields.hpp"
#include "app/registry/lab.hpp"
#include "core/errors.hpp"
#include "store/repository.hpp"

namespace plumb::app {
store::BalanceRecord add_balance(store::Database& db, const store::Actor& actor, const BalanceInput& in) {
  validate_id(in.id, "balance id");
  store::BalanceRecord b;
  b.id = in.id;
  validate_free_text(in.location, "--location", false);
  b.location = in.location;
  b.identity = read_identity(in.identity);
  b.capacity = positive_mass(in.capacity, "--capacity");
  b.readability = positive_mass(in.readability, "--readability");
  if (b.readability >= b.capacity)
    throw InputError(fmt::format("--readability {} must be smaller than --capacity {}.", in.readability, in.capacity));
  b.every = Interval::parse(in.every, "--every");
  b.created_on = in.since ? parse_date(*in.since, "--since") : today_local();
  if (in.smallest_net) {
    b.smallest_net = positive_mass(*in.smallest_net, "--smallest-net");
    if (*b.smallest_net > b.capacity)
      throw InputError(fmt::format("--smallest-net {} exceeds --capacity {}.", *in.smallest_net, in.capacity));
  }
  if (in.max_bias || in.max_sd) {
    b.policy.kind = TolerancePolicy::Kind::lab;
    if (in.max_bias) b.policy.max_bias = positive_mass(*in.max_bias, "--max-bias");
    if (in.max_sd) b.policy.max_sd = positive_mass(*in.max_sd, "--max-sd");
  } else if (!b.smallest_net) {
    throw InputError(
        "--smallest-net is required for the default USP <41> policy (or give the lab's own "
        "--max-bias / --max-sd).");
  }

  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  require_lab(db);
  if (store::instrument_exists(db.sql(), b.id))
    throw InputError(fmt::format("instrument id \"{}\" already exists.", b.id));
  store::Recorder rec(db.sql(), actor);
  store::add_balance(rec, b);
  rec.commit(tx);
  return b;
}

}  // namespace plumb::app
