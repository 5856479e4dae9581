#include "app/calibration/settings.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include "app/registry/lab.hpp"
#include "core/errors.hpp"
#include "metrology/accuracy_classes.hpp"
#include "store/repository.hpp"

namespace plumb::app {

store::CalibrationSettings set_calibration_settings(store::Database& db, const store::Actor& actor,
                                                   const CalibrationSettingsInput& in) {
  store::CalibrationSettings s;
  s.instrument_id = in.instrument_id;
  if (in.accuracy_class)
    s.accuracy_class = std::string(r76::to_string(r76::parse_accuracy_class(*in.accuracy_class, "--class")));
  if (in.tolerance != "r76" && in.tolerance != "usp41" && in.tolerance != "lab")
    throw InputError(fmt::format("--tolerance \"{}\" is not one of r76, usp41, lab.", in.tolerance));
  s.tolerance = in.tolerance;
  if (s.tolerance == "r76" && !s.accuracy_class)
    throw InputError("--class is required with --tolerance r76 (the OIML R 76 MPE depends on the accuracy class).");
  if (in.lab_limit) {
    s.lab_limit = ExactMass::parse(*in.lab_limit, "--lab-limit");
    if (s.lab_limit->in_grams().units() <= 0)
      throw InputError(fmt::format("--lab-limit \"{}\" must be greater than zero.", *in.lab_limit));
  }
  if (in.lab_percent) {
    s.lab_percent = Decimal::parse(*in.lab_percent, "--lab-percent");
    if (s.lab_percent->units() <= 0 || s.lab_percent->to_double() > 100)
      throw InputError(fmt::format("--lab-percent \"{}\" must be above 0 and at most 100.", *in.lab_percent));
  }
  if (s.tolerance == "lab" && !s.lab_limit && !s.lab_percent)
    throw InputError("--tolerance lab needs --lab-limit or --lab-percent (or both: the larger applies).");
  if (s.tolerance != "lab" && (s.lab_limit || s.lab_percent))
    throw InputError(fmt::format("--lab-limit / --lab-percent apply only with --tolerance lab (given: {}).",
                                 s.tolerance));
  s.decision_rule = std::string(checks::key(checks::parse_decision_rule(in.decision_rule, "--decision-rule")));
  s.calibrate_every = Interval::parse(in.calibrate_every, "--calibrate-every");
  s.effective_on = in.since ? parse_date(*in.since, "--since") : today_local();

  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  require_lab(db);
  const auto balance = store::find_balance(db.sql(), in.instrument_id);
  if (!balance) throw InputError(fmt::format("balance \"{}\" is not registered.", in.instrument_id));
  if (in.e) {
    s.verification_interval = ExactMass::parse(*in.e, "--e");
    if (s.verification_interval->in_grams().units() <= 0)
      throw InputError(fmt::format("--e \"{}\" must be greater than zero.", *in.e));
    // OIML R 76-1 3.4.2: d <= e <= 10 d.
    if (*s.verification_interval < balance->readability)
      throw InputError(fmt::format("--e {} is smaller than the readability d = {} of {} (OIML R 76 needs d <= e).",
                                   *in.e, balance->readability.to_string(), balance->id));
    if (*s.verification_interval >= balance->capacity)
      throw InputError(fmt::format("--e {} is not smaller than the capacity {} of {}.", *in.e,
                                   balance->capacity.to_string(), balance->id));
  }
  if (s.accuracy_class) {
    // The class must fit the balance: OIML R 76-1 Table 3 ties each class to a range of e and of n = Max / e.
    const ExactMass e = s.verification_interval.value_or(balance->readability);
    if (const auto fault =
            r76::classification_fault(r76::parse_accuracy_class(*s.accuracy_class), e, balance->capacity))
      throw InputError(fmt::format("--class {} does not fit {} ({}): {}", *s.accuracy_class, balance->id,
                                   in.e ? fmt::format("--e {}", *in.e)
                                        : fmt::format("no --e given, so e = d = {}", balance->readability.to_string()),
                                   *fault));
  }
  store::Recorder rec(db.sql(), actor);
  s.id = store::add_calibration_settings(rec, s);
  rec.commit(tx);
  return *store::find_calibration_settings(db.sql(), s.instrument_id);
}

checks::CalibrationTolerance tolerance_of(const store::CalibrationSettings& s) {
  checks::CalibrationTolerance t;
  if (s.tolerance == "usp41") t.kind = checks::CalibrationTolerance::Kind::usp41;
  else if (s.tolerance == "lab") t.kind = checks::CalibrationTolerance::Kind::lab;
  else t.kind = checks::CalibrationTolerance::Kind::oiml_r76;
  t.verification = r76::Verification::in_service;
  t.lab_limit = s.lab_limit;
  if (s.lab_percent) t.lab_percent = s.lab_percent->to_double();
  return t;
}

checks::DecisionRule rule_of(const store::CalibrationSettings& s) {
  return checks::parse_decision_rule(s.decision_rule, "decision rule");
}

std::string describe(const store::CalibrationSettings& s) {
  std::string out;
  if (s.accuracy_class) out += fmt::format("class {}, ", *s.accuracy_class);
  if (s.verification_interval) out += fmt::format("e = {}, ", s.verification_interval->to_string());
  out += tolerance_of(s).name();
  if (s.lab_limit) out += fmt::format(" +/- {}", s.lab_limit->to_string());
  if (s.lab_percent) out += fmt::format(" +/- {} % of the load", s.lab_percent->to_string());
  out += fmt::format(", decision rule {}, calibrated every {}", checks::to_string(rule_of(s)),
                     s.calibrate_every.to_string());
  return out;
}

}  // namespace plumb::app
