#include "app/registry/weights.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include <array>
#include <cmath>

#include "app/registry/fields.hpp"
#include "app/registry/lab.hpp"
#include "core/condition_units.hpp"
#include "core/errors.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

constexpr std::array weight_classes{"E1", "E2", "F1", "F2", "M1", "M1-2", "M2", "M2-3", "M3"};


}  // namespace

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
    w.density_kg_m3 = parse_kg_per_cubic_metre(*in.density, "--density");
    if (w.density_kg_m3->to_double() < 1000 || w.density_kg_m3->to_double() > 25000)
      throw InputError(
          fmt::format("--density \"{}\" ({} kg/m3) is outside the range of weight materials (1000 to "
                      "25000 kg/m3).",
                      *in.density, w.density_kg_m3->to_string()));
  }
  validate_free_text(in.certificate, "--certificate", false);
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

}  // namespace plumb::app
