#include "app/registry/weights.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include "app/registry/fields.hpp"
#include "app/registry/lab.hpp"
#include "app/registry/weight_in_force.hpp"
#include "core/condition_units.hpp"
#include "core/errors.hpp"
#include "metrology/weight_classes.hpp"
#include "store/repository.hpp"
#include "store/weight_certificates.hpp"

namespace plumb::app {

store::WeightRecord add_weight(store::Database& db, const store::Actor& actor, const WeightInput& in) {
  validate_id(in.id, "weight id");
  store::WeightRecord w;
  w.id = in.id;
  w.nominal_text = in.nominal;
  w.nominal = positive_mass(in.nominal, "--nominal");
  w.weight_class = std::string(weights::to_string(weights::parse_weight_class(in.weight_class, "--class")));
  const WeightPropertiesInput stated{in.density, in.density_u, in.density_class, in.drift};
  std::optional<store::WeightProperties> properties;
  if (!stated.empty()) {
    properties = parse_weight_properties(stated, w, std::nullopt);
    w.density_kg_m3 = properties->density_kg_m3;
  }
  const WeightCertificateInput typed{in.certificate, in.correction, in.uncertainty,    in.k,
                                     in.calibrated,  in.due,        in.override_reason};
  w.current = parse_weight_certificate(typed, w.nominal);
  auto override_record = judge_against_class(w, w.current, typed);

  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  require_lab(db);
  if (store::find_weight(db.sql(), w.id))
    throw InputError(fmt::format(
        "weight id \"{}\" already exists; record a new certificate with `plumb weight recalibrate {}`.", w.id, w.id));
  store::Recorder rec(db.sql(), actor);
  const std::int64_t certificate_id = store::add_weight(rec, w);
  if (override_record) {
    override_record->weight_calibration_id = certificate_id;
    store::add_weight_class_override(rec, *override_record);
  }
  if (properties) store::add_weight_properties(rec, *properties);
  rec.commit(tx);
  return *store::find_weight(db.sql(), w.id);
}

RecalibrationOutcome recalibrate_weight(store::Database& db, const store::Actor& actor, const std::string& id,
                                        const WeightCertificateInput& in) {
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  require_lab(db);
  auto weight = store::find_weight(db.sql(), id);
  if (!weight) throw InputError(fmt::format("weight \"{}\" is not a known reference weight.", id));
  const store::WeightCalibration certificate = parse_weight_certificate(in, weight->nominal);
  auto history = store::weight_certificates(db.sql(), id);
  for (const auto& earlier : history)
    if (earlier.certificate_no == certificate.certificate_no)
      throw InputError(fmt::format("--certificate {} is already recorded for weight {} (calibrated {}).",
                                   certificate.certificate_no, id, to_string(earlier.calibrated_on)));
  auto override_record = judge_against_class(*weight, certificate, in);

  store::Recorder rec(db.sql(), actor);
  RecalibrationOutcome out;
  out.weight = *weight;
  out.weight.current = certificate;
  out.weight.current.id = store::add_weight_calibration(rec, id, certificate);
  if (override_record) {
    override_record->weight_calibration_id = out.weight.current.id;
    out.overridden = override_record->beyond;
    store::add_weight_class_override(rec, *override_record);
  }
  rec.commit(tx);
  history = store::weight_certificates(db.sql(), id);
  const store::WeightCalibration* today = certificate_in_force(history, today_utc());
  out.in_force_today = today && today->id == out.weight.current.id;
  return out;
}

}  // namespace plumb::app
