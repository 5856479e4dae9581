#include "app/weekly_check/record.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>
#include <fmt/ranges.h>

#include <charconv>

#include "app/registry/registry.hpp"
#include "app/registry/service_status.hpp"
#include "app/registry/weight_in_force.hpp"
#include "checks/repeatability.hpp"
#include "core/errors.hpp"
#include "core/readings_csv.hpp"
#include "report/runs/json.hpp"
#include "store/calibration.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

/// Decimals a reading shows once expressed in grams: "100.0003" g -> 4; "100000.3" mg -> 4.
int decimals_in_grams(const MassReading& r) { return r.value.scale() - exponent_to_gram(r.unit); }

/// Later than any certificate date: asks for a weight's whole certificate history.
constexpr Date end_of_history{date::year{9999}, date::December, date::day{31}};

}  // namespace

std::vector<std::string> known_procedures() { return {"repeatability", "calibration", "gravimetric"}; }

void CheckLookups::require_lab() {
  if (lab_checked_) return;
  app::require_lab(db_);
  lab_checked_ = true;
}

void CheckLookups::load_all() {
  require_lab();
  for (auto& b : store::list_balances(db_.sql())) {
    std::string id = b.id;
    balances_.insert_or_assign(std::move(id), std::move(b));
  }
  for (auto& w : store::list_weights(db_.sql())) {
    std::string id = w.id;
    auto calibrations = store::weight_calibrations_until(db_.sql(), id, end_of_history);
    weights_.insert_or_assign(std::move(id), WeightHistory{std::move(w), std::move(calibrations)});
  }
  for (const char* kind : {"instrument", "weight"})
    for (const auto& id : store::retired_ids(db_.sql(), kind))
      retirements_[std::string(kind) + '/' + id] = store::retirement(db_.sql(), kind, id);
  all_loaded_ = true;
}

const store::BalanceRecord& CheckLookups::balance(const std::string& id) {
  auto it = balances_.find(id);
  if (it == balances_.end()) {
    auto b = all_loaded_ ? std::nullopt : store::find_balance(db_.sql(), id);
    if (!b) throw InputError(fmt::format("balance \"{}\" is not registered.", id));
    it = balances_.emplace(id, std::move(*b)).first;
  }
  return it->second;
}

store::WeightRecord CheckLookups::traceable_weight(const std::string& id, Date on) {
  auto it = weights_.find(id);
  if (it == weights_.end()) {
    auto w = all_loaded_ ? std::nullopt : store::find_weight(db_.sql(), id);
    if (!w) throw InputError(fmt::format("--weight \"{}\" is not a known reference weight.", id));
    auto calibrations = store::weight_calibrations_until(db_.sql(), id, end_of_history);
    it = weights_.emplace(id, WeightHistory{std::move(*w), std::move(calibrations)}).first;
  }
  const WeightHistory& h = it->second;
  const store::WeightCalibration* in_force = certificate_in_force(h.calibrations, on);
  if (!in_force)
    throw InputError(fmt::format("--weight {} has no calibration certificate dated on or before the check date {}.",
                                 id, to_string(on)));
  // A reference weight whose own calibration is overdue may not be used to verify an instrument.
  if (overdue_on(*in_force, on))
    throw InputError(fmt::format("--weight {} was due for calibration on {} (certificate {}), before the check date "
                                 "{}; an overdue weight cannot give a traceable check.",
                                 id, to_string(in_force->due_on), in_force->certificate_no, to_string(on)));
  store::WeightRecord w = h.weight;
  w.current = *in_force;
  return w;
}

void CheckLookups::require_in_service(const std::string& item_kind, const std::string& id) {
  const std::string key = item_kind + '/' + id;
  auto it = retirements_.find(key);
  if (it == retirements_.end()) {
    // Loaded: only retired items are listed, so a missing one is in service.
    it = retirements_.emplace(key, all_loaded_ ? std::nullopt : store::retirement(db_.sql(), item_kind, id)).first;
  }
  app::require_in_service(item_kind, id, it->second);  // throws when retired
}

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
  CheckLookups lookups(db);
  const std::int64_t id = record_check_in(rec, lookups, in).run_id;
  tx.commit();
  return *store::find_run(db.sql(), id);
}

RecordedCheck record_check_in(store::Recorder& rec, CheckLookups& lookups, const CheckInput& in) {
  const store::RunRecord run = build_check_run(lookups, in);
  return {store::add_run(rec, run), run.verdict};
}

store::RunRecord build_check_run(CheckLookups& lookups, const CheckInput& in) {
  const auto procedures = known_procedures();
  if (std::find(procedures.begin(), procedures.end(), in.procedure) == procedures.end())
    throw InputError(fmt::format("--procedure \"{}\" is not known (known: {}).", in.procedure,
                                 fmt::join(procedures, ", ")));
  if (in.procedure == "calibration")  // recorded by app/calibration/record.hpp from a calibration run file
    throw InputError("--procedure calibration is recorded from a calibration run file (record_calibration).");
  if (in.procedure == "gravimetric")  // pipettes: app/pipette/record.hpp
    throw InputError("--procedure gravimetric is recorded for a pipette with --balance and the conditions of the run.");
  const Date on = parse_date(in.on, "--on");
  if (days_between(today_utc(), on) > 1)
    throw InputError(fmt::format("--on {} is in the future.", in.on));
  if (in.operator_name.empty()) throw InputError("--by must name the operator who performed the check.");
  if (in.weight_ids.size() != 1)
    throw InputError(fmt::format("--weight: a repeatability check uses exactly one reference weight ({} given).",
                                 in.weight_ids.size()));
  std::vector<CsvReading> parsed;
  if (!in.parsed_readings) parsed = parse_readings_csv(in.readings_csv, in.readings_source, in.default_unit);
  const std::vector<CsvReading>& readings = in.parsed_readings ? *in.parsed_readings : parsed;
  lookups.require_lab();
  const store::BalanceRecord* balance = &lookups.balance(in.instrument_id);
  const store::WeightRecord weight = lookups.traceable_weight(in.weight_ids[0], on);
  // Retired items take no new checks; a correction of an earlier run is not a new check.
  if (!in.supersedes) {
    lookups.require_in_service("instrument", balance->id);
    lookups.require_in_service("weight", weight.id);
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
