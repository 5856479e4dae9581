#include "app/record_check.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>
#include <fmt/ranges.h>

#include <charconv>

#include "app/registry.hpp"
#include "app/service_status.hpp"
#include "checks/repeatability.hpp"
#include "core/errors.hpp"
#include "core/readings_csv.hpp"
#include "report/check_json.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

/// Decimals a reading shows once expressed in grams: "100.0003" g -> 4; "100000.3" mg -> 4.
int decimals_in_grams(const MassReading& r) { return r.value.scale() - exponent_to_gram(r.unit); }

store::WeightRecord traceable_weight(store::Database& db, const std::string& id, Date on) {
  if (!store::find_weight(db.sql(), id)) throw InputError(fmt::format("--weight \"{}\" is not a known reference weight.", id));
  auto w = store::find_weight_on(db.sql(), id, on);
  if (!w)
    throw InputError(fmt::format("--weight {} has no calibration certificate dated on or before the check date {}.",
                                 id, to_string(on)));
  // A reference weight whose own calibration is overdue may not be used to verify an instrument.
  if (days_between(w->current.due_on, on) > 0)
    throw InputError(fmt::format("--weight {} was due for calibration on {} (certificate {}), before the check date "
                                 "{}; an overdue weight cannot give a traceable check.",
                                 id, to_string(w->current.due_on), w->current.certificate_no, to_string(on)));
  return *w;
}

}  // namespace

std::vector<std::string> known_procedures() { return {"repeatability", "calibration", "gravimetric"}; }

std::int64_t resolve_run(store::Database& db, const std::string& selector) {
  if (selector == "LAST") {
    auto id = store::last_run_id(db.sql());
    if (!id) throw InputError("run LAST: no check has been recorded yet.");
    return *id;
  }
  std::int64_t id = 0;
  const auto [p, ec] = std::from_chars(selector.data(), selector.data() + selector.size(), id);
  if (ec != std::errc() || p != selector.data() + selector.size() || id <= 0)
    throw InputError(fmt::format("run \"{}\" is not a run number or LAST.", selector));
  if (!store::find_run(db.sql(), id)) throw InputError(fmt::format("run {} does not exist.", id));
  return id;
}

store::RunRecord record_check(store::Database& db, const store::Actor& actor, const CheckInput& in) {
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::Recorder rec(db.sql(), actor);
  const std::int64_t id = record_check_in(db, rec, in);
  tx.commit();
  return *store::find_run(db.sql(), id);
}

std::int64_t record_check_in(store::Database& db, store::Recorder& rec, const CheckInput& in) {
  const auto procedures = known_procedures();
  if (std::find(procedures.begin(), procedures.end(), in.procedure) == procedures.end())
    throw InputError(fmt::format("--procedure \"{}\" is not known (known: {}).", in.procedure,
                                 fmt::join(procedures, ", ")));
  if (in.procedure == "calibration")  // recorded by app/record_calibration.hpp from a calibration run file
    throw InputError("--procedure calibration is recorded from a calibration run file (record_calibration).");
  if (in.procedure == "gravimetric")  // pipettes: app/record_pipette_check.hpp
    throw InputError("--procedure gravimetric is recorded for a pipette with --balance and the conditions of the run.");
  const Date on = parse_date(in.on, "--on");
  if (days_between(today_utc(), on) > 1)
    throw InputError(fmt::format("--on {} is in the future.", in.on));
  if (in.operator_name.empty()) throw InputError("--by must name the operator who performed the check.");
  if (in.weight_ids.size() != 1)
    throw InputError(fmt::format("--weight: a repeatability check uses exactly one reference weight ({} given).",
                                 in.weight_ids.size()));
  auto readings = parse_readings_csv(in.readings_csv, in.readings_source, in.default_unit);
  if (in.reading_lines.size() == readings.size())
    for (std::size_t i = 0; i < readings.size(); ++i) readings[i].line = in.reading_lines[i];
  require_lab(db);
  const auto balance = store::find_balance(db.sql(), in.instrument_id);
  if (!balance) throw InputError(fmt::format("balance \"{}\" is not registered.", in.instrument_id));
  const store::WeightRecord weight = traceable_weight(db, in.weight_ids[0], on);
  // Retired items take no new checks; a correction of an earlier run is not a new check.
  if (!in.supersedes) {
    require_in_service(db, "instrument", balance->id);
    require_in_service(db, "weight", weight.id);
  }

  const int allowed = balance->readability.in_grams().significant_scale();
  checks::RepeatabilityInput input;
  for (const auto& r : readings) {
    if (decimals_in_grams(r.reading) > allowed)
      throw InputError(fmt::format("{} line {}: reading \"{}\" {} shows more decimals than the readability {} of {} "
                                   "allows.",
                                   in.readings_source, r.line, r.reading.text, to_string(r.reading.unit),
                                   balance->readability.to_string(), balance->id));
    const ExactMass m = r.reading.mass();
    if (m > balance->capacity)
      throw InputError(fmt::format("{} line {}: reading \"{}\" {} exceeds the capacity {} of {}.", in.readings_source,
                                   r.line, r.reading.text, to_string(r.reading.unit), balance->capacity.to_string(),
                                   balance->id));
    input.readings_g.push_back(m.in_grams());
  }
  if (readings.size() < checks::min_readings)
    throw InputError(fmt::format("{}: {} reading(s); a repeatability check needs at least {}.", in.readings_source,
                                 readings.size(), checks::min_readings));
  input.balance = {balance->capacity, balance->readability, balance->smallest_net};
  input.weight.id = weight.id;
  input.weight.conventional_mass = weight.conventional_mass();
  input.weight.expanded_uncertainty = weight.current.uncertainty.approx();
  input.weight.coverage_factor = weight.current.k.to_double();
  input.policy = balance->policy;
  const checks::RepeatabilityResult result = checks::evaluate_repeatability(input);

  store::RunRecord run;
  run.instrument_id = balance->id;
  run.procedure = in.procedure;
  run.performed_on = on;
  run.operator_name = in.operator_name;
  run.results = report::to_json(result);
  run.results["policy"] = balance->policy.key();
  run.results["policy_name"] = balance->policy.name();
  run.verdict = result.verdict;
  run.supersedes = in.supersedes;
  run.reason = in.reason;
  if (result.verdict == Verdict::pass) run.next_due = add_interval(on, balance->every);
  run.weights.push_back({weight.id, weight.current.id});
  int seq = 1;
  for (const auto& r : readings) run.readings.push_back({seq++, "", r.reading});

  return store::add_run(rec, run);
}

}  // namespace plumb::app
