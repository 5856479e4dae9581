#include "app/registry/registry.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include <array>

#include "core/errors.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

constexpr std::array weight_classes{"E1", "E2", "F1", "F2", "M1", "M1-2", "M2", "M2-3", "M3"};

ExactMass positive_mass(const std::string& text, std::string_view field) {
  const ExactMass m = ExactMass::parse(text, field);
  if (m <= ExactMass{}) throw InputError(fmt::format("{} \"{}\" must be greater than zero.", field, text));
  return m;
}

}  // namespace

void validate_id(const std::string& id, std::string_view field) {
  const bool ok = !id.empty() && id.size() <= 64 && id != "LAST" &&
                  std::all_of(id.begin(), id.end(), [](unsigned char c) {
                    return std::isalnum(c) || c == '-' || c == '_' || c == '.';
                  });
  if (!ok)
    throw InputError(fmt::format("{} \"{}\" is not a valid id (1-64 letters, digits, '-', '_' or '.').", field, id));
}

store::LabRecord require_lab(store::Database& db) {
  auto lab = store::find_lab(db.sql());
  if (!lab)
    throw InputError(fmt::format("database \"{}\" has no lab yet; run `plumb --db {} init --lab NAME` first.",
                                 db.path().string(), db.path().string()));
  return *lab;
}

void init_lab(store::Database& db, const store::Actor& actor, const std::string& name) {
  if (name.empty() || name.size() > 200) throw InputError("--lab must name the laboratory (1-200 characters).");
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  if (auto lab = store::find_lab(db.sql()))
    throw InputError(fmt::format("database \"{}\" is already set up for lab \"{}\".", db.path().string(), lab->name));
  store::Recorder rec(db.sql(), actor);
  store::add_lab(rec, name);
  tx.commit();
}

store::WeightRecord add_weight(store::Database& db, const store::Actor& actor, const WeightInput& in) {
  validate_id(in.id, "weight id");
  store::WeightRecord w;
  w.id = in.id;
  w.nominal_text = in.nominal;
  w.nominal = positive_mass(in.nominal, "--nominal");
  if (std::find(weight_classes.begin(), weight_classes.end(), in.weight_class) == weight_classes.end())
    throw InputError(fmt::format("--class \"{}\" is not an OIML R 111 weight class (E1, E2, F1, F2, M1, M1-2, M2, "
                                 "M2-3, M3).",
                                 in.weight_class));
  w.weight_class = in.weight_class;
  if (in.density) {
    w.density_kg_m3 = Decimal::parse(*in.density, "--density");
    if (w.density_kg_m3->to_double() < 1000 || w.density_kg_m3->to_double() > 25000)
      throw InputError(fmt::format("--density \"{}\" kg/m3 is outside the range of weight materials (1000-25000).",
                                   *in.density));
  }
  w.current.certificate_no = in.certificate;
  if (in.certificate.empty()) throw InputError("--certificate must give the weight's calibration certificate number.");
  w.current.correction = ExactMass::parse(in.correction, "--correction");
  w.current.uncertainty = positive_mass(in.uncertainty, "--uncertainty");
  w.current.k = Decimal::parse(in.k, "--k");
  if (w.current.k.to_double() < 1 || w.current.k.to_double() > 10)
    throw InputError(fmt::format("--k \"{}\" is not a plausible coverage factor (1 to 10).", in.k));
  w.current.calibrated_on = parse_date(in.calibrated, "--calibrated");
  w.current.due_on = parse_date(in.due, "--due");
  if (days_between(w.current.calibrated_on, w.current.due_on) <= 0)
    throw InputError(fmt::format("--due {} is not after --calibrated {}.", in.due, in.calibrated));
  const Decimal nominal_g = w.nominal.in_grams();
  const Decimal correction_g = w.current.correction.in_grams();
  if (std::abs(correction_g.to_double()) > 0.01 * nominal_g.to_double())
    throw InputError(fmt::format("--correction {} is more than 1 % of the nominal value {}; check the unit.",
                                 in.correction, in.nominal));

  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  require_lab(db);
  if (store::find_weight(db.sql(), w.id))
    throw InputError(fmt::format("weight id \"{}\" already exists.", w.id));
  store::Recorder rec(db.sql(), actor);
  store::add_weight(rec, w);
  tx.commit();
  return *store::find_weight(db.sql(), w.id);
}

store::BalanceRecord add_balance(store::Database& db, const store::Actor& actor, const BalanceInput& in) {
  validate_id(in.id, "balance id");
  store::BalanceRecord b;
  b.id = in.id;
  b.location = in.location;
  b.capacity = positive_mass(in.capacity, "--capacity");
  b.readability = positive_mass(in.readability, "--readability");
  if (b.readability >= b.capacity)
    throw InputError(fmt::format("--readability {} must be smaller than --capacity {}.", in.readability, in.capacity));
  b.every = Interval::parse(in.every, "--every");
  b.created_on = in.since ? parse_date(*in.since, "--since") : today_utc();
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
    throw InputError("--smallest-net is required for the default USP <41> policy (or give the lab's own "
                     "--max-bias / --max-sd).");
  }

  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  require_lab(db);
  if (store::instrument_exists(db.sql(), b.id))
    throw InputError(fmt::format("instrument id \"{}\" already exists.", b.id));
  store::Recorder rec(db.sql(), actor);
  store::add_balance(rec, b);
  tx.commit();
  return b;
}

}  // namespace plumb::app
