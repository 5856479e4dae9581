#include "app/weekly_check/record.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include "app/registry/fields.hpp"
#include "checks/repeatability.hpp"
#include "core/errors.hpp"
#include "core/readings_csv.hpp"
#include "report/weekly_check/json.hpp"
#include "store/repository.hpp"

namespace plumb::app {
store::RunRecord record_check(store::Database& db, const store::Actor& actor, const CheckInput& in) {
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::Recorder rec(db.sql(), actor);
  CheckLookups lookups(db);
  const std::int64_t id = record_check_in(rec, lookups, in).run_id;
  rec.commit(tx);
  return *store::find_run(db.sql(), id);
}

RecordedCheck record_check_in(store::Recorder& rec, CheckLookups& lookups, const CheckInput& in,
                              const store::RunDetails& details) {
  const store::RunRecord run = build_check_run(lookups, in);
  return {store::add_run(rec, run, details), run.verdict};
}

WeeklyCheckSetup prepare_weekly_check(CheckLookups& lookups, const CheckInput& in) {
  const Date on = parse_date(in.on, "--on");
  if (days_between(today_utc(), on) > 1) throw InputError(fmt::format("--on {} is in the future.", in.on));
  if (in.operator_name.empty()) throw InputError("operator: the check needs the name of who performed it.");
  validate_free_text(in.operator_name, "operator");
  if (in.weight_ids.size() != 1)
    throw InputError(fmt::format("--weight: a repeatability check uses exactly one reference weight ({} given).",
                                 in.weight_ids.size()));
  lookups.require_lab();
  WeeklyCheckSetup setup{on, lookups.balance_on(in.instrument_id, on), lookups.traceable_weight(in.weight_ids[0], on)};
  const store::BalanceRecord* balance = &setup.balance;
  const store::WeightRecord& weight = setup.weight;
  // Retired items take no new checks; a correction of an earlier run is not a new check.
  if (!in.supersedes) {
    lookups.require_in_service("instrument", balance->id);
    lookups.require_in_service("weight", weight.id);
  }

  // Capacity is a property of the load, not of what the balance shows: a full-capacity weight on a balance that
  // reads high is still within its range (and the bias will say how high it reads).
  if (weight.nominal > balance->capacity)
    throw InputError(fmt::format("--weight {}: the load {} is above the capacity {} of {}.", weight.id,
                                 weight.nominal.to_string(), balance->capacity.to_string(), balance->id));
  return setup;
}

void check_weekly_reading(const MassReading& reading, std::string_view where, const store::BalanceRecord& balance) {
  const int allowed = balance.readability.in_grams().significant_scale();
  if (reading.decimals_in_grams() > allowed)
    throw InputError(fmt::format("{}: reading \"{}\" {} shows more decimals than the readability {} of {} allows.",
                                 where, reading.text, to_string(reading.unit), balance.readability.to_string(),
                                 balance.id));
  if (reading.mass() < ExactMass{})
    throw InputError(
        fmt::format("{}: reading \"{}\" {} is negative, which no load on the pan can show; check the "
                    "tare and the file.",
                    where, reading.text, to_string(reading.unit)));
}

store::RunRecord build_check_run(CheckLookups& lookups, const CheckInput& in) {
  const WeeklyCheckSetup setup = prepare_weekly_check(lookups, in);
  const Date on = setup.on;
  const store::BalanceRecord* balance = &setup.balance;
  const store::WeightRecord& weight = setup.weight;
  std::vector<CsvReading> parsed;
  if (!in.parsed_readings) parsed = parse_readings_csv(in.readings_csv, in.readings_source, in.default_unit);
  const std::vector<CsvReading>& readings = in.parsed_readings ? *in.parsed_readings : parsed;
  checks::RepeatabilityInput input;
  for (const auto& r : readings) {
    check_weekly_reading(r.reading, fmt::format("{} line {}", in.readings_source, r.line), *balance);
    input.readings.push_back(r.reading.mass());
  }
  checks::require_enough_readings(readings.size(), balance->policy, in.readings_source);
  input.balance = {balance->capacity, balance->readability, balance->smallest_net};
  input.weight.id = weight.id;
  input.weight.conventional_mass = weight.conventional_mass();
  input.weight.nominal = weight.nominal;
  input.weight.expanded_uncertainty = weight.current.uncertainty.approx();
  input.weight.coverage_factor = weight.current.k.to_double();
  input.policy = balance->policy;
  const checks::RepeatabilityResult result = checks::evaluate_repeatability(input);

  store::RunRecord run;
  run.instrument_id = balance->id;
  run.procedure = checks::Procedure::repeatability;
  run.performed_on = on;
  run.operator_name = in.operator_name;
  run.results_text = report::repeatability_results_text(result, balance->policy.key(), balance->policy.name());
  run.verdict = result.verdict;
  run.supersedes = in.supersedes;
  run.reason = in.reason;
  if (result.verdict == Verdict::pass) run.next_due = add_interval(on, balance->every);
  run.weights.push_back({weight.id, weight.current.id});
  int seq = 1;
  for (const auto& r : readings) run.readings.push_back({seq++, "", r.reading});

  return run;
}

}  // namespace plumb::app
