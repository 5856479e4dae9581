#include "app/calibration/record.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include <cmath>
#include <map>
#include <set>

#include "app/calibration/run_file.hpp"
#include "app/calibration/settings.hpp"
#include "app/registry/fields.hpp"
#include "app/registry/lab.hpp"
#include "app/registry/service_status.hpp"
#include "app/registry/weight_in_force.hpp"
#include "app/registry/weight_properties.hpp"
#include "checks/calibration.hpp"
#include "core/condition_units.hpp"
#include "core/errors.hpp"
#include "report/calibration/json.hpp"
#include "store/calibration.hpp"
#include "store/repository.hpp"
#include "store/weight_properties.hpp"

namespace plumb::app {
namespace {

using nlohmann::json;

/// A load as the file names it: one weight combination within one stage and part.
struct FileLoad {
  std::string stage, part, combination;  ///< combination canonical: "W100+W50"
  int first_line = 0;
  std::vector<std::string> weight_ids;
  ExactMass nominal, conventional;
  std::vector<const CalibrationRow*> rows;
};

struct UsedWeight {
  store::WeightRecord record;
  std::optional<store::WeightCalibration> previous;  ///< the certificate before the current one, for drift
  std::optional<ExactMass> drift;
  std::string drift_basis;  ///< where D came from, or why there is none
  WeightDensity density;
};

ExactMass abs_mass(ExactMass m) {
  return m < ExactMass{} ? ExactMass{} - m : m;
}

/// An environment option with its unit (core/condition_units.hpp), inside [lo, hi].
std::optional<double> environment_value(const std::optional<std::string>& text, const char* option,
                                        Decimal (*parse)(std::string_view, std::string_view), double lo, double hi,
                                        const char* unit, const char* what) {
  if (!text) return std::nullopt;
  const Decimal value = parse(*text, option);
  const double v = value.to_double();
  if (v < lo || v > hi)
    throw InputError(
        fmt::format("{} {} {} is outside {} ({} to {} {}).", option, value.to_string(), unit, what, lo, hi, unit));
  return v;
}

class RunBuilder {
 public:
  RunBuilder(store::Database& db, const CalibrationRunInput& in, Date on, const store::BalanceRecord& b)
      : db_(db), in_(in), on_(on), balance_(b) {}

  const UsedWeight& weight(const std::string& id, int line) {
    if (auto it = weights_.find(id); it != weights_.end()) return it->second;
    const std::string where = fmt::format("{} line {} column load", in_.readings_source, line);
    auto w = store::find_weight(db_.sql(), id);
    if (!w) throw InputError(fmt::format("{}: weight \"{}\" is not a known reference weight.", where, id));
    const auto history = store::weight_calibrations_until(db_.sql(), id, on_);
    const store::WeightCalibration* in_force = certificate_in_force(history, on_);
    if (!in_force)
      throw InputError(fmt::format("{}: weight {} has no calibration certificate dated on or before the run date {}.",
                                   where, id, to_string(on_)));
    // A reference weight whose own calibration is overdue may not be used (common practice).
    if (overdue_on(*in_force, on_))
      throw InputError(
          fmt::format("{}: weight {} was due for calibration on {} (certificate {}), before the run date "
                      "{}; an overdue weight cannot give a traceable calibration.",
                      where, id, to_string(in_force->due_on), in_force->certificate_no, to_string(on_)));
    require_in_service(db_, "weight", id);
    w->current = *in_force;
    const auto stated = store::weight_properties_in_force(db_.sql(), id);
    UsedWeight u{*w, std::nullopt, std::nullopt, {}, {}};
    try {
      u.density = density_for_budget(*w, stated);
    } catch (const InputError& e) {
      throw InputError(fmt::format("{}: {}", where, e.what()));
    }
    // Drift D (EURAMET cg-18): estimated from the change between the weight's last two certificates, or the
    // allowance the lab stated; with both, the larger (the allowance is the lab's own bound on the change).
    for (std::size_t i = 1; i < history.size(); ++i)
      if (history[i].id == in_force->id) u.previous = history[i - 1];
    const std::optional<ExactMass> allowance = stated ? stated->drift : std::nullopt;
    if (u.previous) {
      u.drift = abs_mass(w->current.correction - u.previous->correction);
      u.drift_basis = fmt::format("change since certificate {} of {}", u.previous->certificate_no,
                                  to_string(u.previous->calibrated_on));
      if (allowance && *u.drift < *allowance) {
        u.drift_basis = fmt::format("drift allowance entered by {} (larger than the {} {})", stated->by_name,
                                    u.drift->to_string(), u.drift_basis);
        u.drift = allowance;
      }
    } else if (allowance) {
      u.drift = allowance;
      u.drift_basis = fmt::format("drift allowance entered {} by {}; no earlier certificate",
                                  stated->recorded_at.substr(0, 10), stated->by_name);
    } else {
      u.drift_basis = "no earlier certificate and no drift allowance entered: drift not included";
    }
    order_.push_back(id);
    return weights_.emplace(id, std::move(u)).first->second;
  }

  FileLoad& load_of(const CalibrationRow& r) {
    const std::string where = fmt::format("{} line {} column load", in_.readings_source, r.line);
    const auto ids = checks::parse_combination(r.load, where);
    std::set<std::string> seen;
    std::string canonical;
    for (const auto& id : ids) {
      if (!seen.insert(id).second)
        throw InputError(fmt::format("{}: weight {} is named twice in \"{}\"; each weight can be on the pan once.",
                                     where, id, r.load));
      canonical += (canonical.empty() ? "" : "+") + id;
    }
    for (auto& l : loads_)
      if (l.stage == r.stage && l.part == r.part && l.combination == canonical) return l;
    FileLoad l{r.stage, r.part, canonical, r.line, ids, {}, {}, {}};
    for (const auto& id : ids) {
      const auto& w = weight(id, r.line);
      l.nominal = l.nominal + w.record.nominal;
      l.conventional = l.conventional + w.record.conventional_mass();
    }
    if (l.nominal > balance_.capacity)
      throw InputError(fmt::format("{}: the load {} = {} is above the capacity {} of {}.", where, canonical,
                                   l.nominal.to_string(), balance_.capacity.to_string(), balance_.id));
    loads_.push_back(std::move(l));
    return loads_.back();
  }

  std::vector<FileLoad>& loads() { return loads_; }
  const std::vector<std::string>& weight_order() const { return order_; }
  const UsedWeight& used(const std::string& id) const { return weights_.at(id); }

 private:
  store::Database& db_;
  const CalibrationRunInput& in_;
  Date on_;
  const store::BalanceRecord& balance_;
  std::map<std::string, UsedWeight> weights_;
  std::vector<std::string> order_;
  std::vector<FileLoad> loads_;
};

std::vector<FileLoad*> loads_of(std::vector<FileLoad>& loads, const std::string& stage, const std::string& part) {
  std::vector<FileLoad*> out;
  for (auto& l : loads)
    if (l.stage == stage && l.part == part) out.push_back(&l);
  return out;
}

/// Builds one stage's set, checking what the file alone can show (with its lines) before the pure layer runs.
checks::CalibrationSet build_set(std::vector<FileLoad>& loads, const std::string& stage, const std::string& source,
                                 stats::Model model) {
  checks::CalibrationSet set;
  for (auto* l : loads_of(loads, stage, "repeatability")) {
    if (l->rows.size() < checks::min_repeatability_readings)
      throw InputError(fmt::format(
          "{} line {}: the {} repeatability series at {} has {} reading(s); at least {} are "
          "needed (10 recommended).",
          source, l->first_line, stage, l->combination, l->rows.size(), checks::min_repeatability_readings));
    checks::RepeatabilitySeries s{l->conventional, {}};
    for (const auto* r : l->rows) s.readings.push_back(r->reading.mass());
    set.repeatability.push_back(std::move(s));
  }
  const auto ecc = loads_of(loads, stage, "eccentricity");
  if (ecc.size() > 1)
    throw InputError(
        fmt::format("{} line {} column load: the {} eccentricity test uses one load, but {} was read "
                    "before (line {}).",
                    source, ecc[1]->first_line, stage, ecc[0]->combination, ecc[0]->first_line));
  if (!ecc.empty()) {
    checks::EccentricityInput e;
    e.load = ecc[0]->conventional;
    std::map<std::string, int> seen;
    for (const auto* r : ecc[0]->rows) {
      if (auto [it, fresh] = seen.emplace(r->position, r->line); !fresh)
        throw InputError(
            fmt::format("{} line {} column position: \"{}\" is read twice in the {} eccentricity test "
                        "(first on line {}).",
                        source, r->line, r->position, stage, it->second));
      const ExactMass m = r->reading.mass();
      if (r->position == "centre")
        e.centre = m;
      else
        e.positions.push_back({r->position, m});
    }
    if (!e.centre)
      throw InputError(
          fmt::format("{} line {} column position: the {} eccentricity test has no reading at the "
                      "centre; the deviations are taken from it.",
                      source, ecc[0]->first_line, stage));
    if (e.positions.size() < checks::min_eccentricity_positions)
      throw InputError(
          fmt::format("{} line {} column position: the {} eccentricity test has {} off-centre "
                      "position(s); at least {} are needed.",
                      source, ecc[0]->first_line, stage, e.positions.size(), checks::min_eccentricity_positions));
    set.eccentricity = std::move(e);
  }
  const auto ind = loads_of(loads, stage, "indication");
  if (ind.size() < checks::min_loads)
    throw InputError(fmt::format("{}: the {} error of indication has {} load(s); at least {} are needed (5 to 11).",
                                 source, stage, ind.size(), checks::min_loads));
  std::set<std::string> distinct;
  for (const auto* l : ind) distinct.insert(l->conventional.in_grams().to_string());
  const std::size_t needed = model == stats::Model::quadratic ? 3 : model == stats::Model::line ? 2 : 1;
  if (distinct.size() < needed)
    throw InputError(
        fmt::format("--model {}: the {} error of indication has {} distinct load(s); this model needs at "
                    "least {}.",
                    report::model_key(model), stage, distinct.size(), needed));
  for (const auto* l : ind) {
    checks::LoadPoint p{l->combination, {}, {}};
    for (const auto* r : l->rows) (r->direction == "down" ? p.down : p.up).push_back(r->reading.mass());
    if (p.up.empty())
      throw InputError(fmt::format("{} line {} column direction: the {} load {} has no reading going up.", source,
                                   l->first_line, stage, l->combination));
    set.loads.push_back(std::move(p));
  }
  return set;
}

/// How the air density's u was formed: the formula's own u and each instrument's u through its sensitivity.
std::string air_statement(const density::AirDensity& air, const density::Environment& env,
                          const std::optional<std::string>& u_t, const std::optional<std::string>& u_p,
                          const std::optional<std::string>& u_h) {
  const auto part = [](const char* what, const std::optional<std::string>& entered, double u, double c,
                       const char* unit, const char* per) {
    if (!entered) return fmt::format("{} not entered", what);
    return fmt::format("{} = {} {} x {:.3g} kg/m3 per {} = {:.2g} kg/m3", what, *entered, unit, std::abs(c), per,
                       std::abs(c) * u);
  };
  return fmt::format(
      "air density {:.5f} kg/m3 from t, p and h by {}; u = {:.2g} kg/m3 combines the equation's own "
      "relative u {:.2g} ({:.2g} kg/m3) with u(t), u(p), u(h) through the formula's sensitivity "
      "coefficients: {}; {}; {}",
      air.rho, density::to_string(air.formula), air.u, density::formula_relative_uncertainty(air.formula),
      air.u_formula, part("u(t)", u_t, env.u_t_c, air.dt, "degC", "K"),
      part("u(p)", u_p, env.u_pressure_hpa, air.dp, "hPa", "hPa"),
      part("u(h)", u_h, env.u_rh_pct, air.dh, "%RH", "%RH"));
}

json weight_trace(const std::string& id, const UsedWeight& u) {
  const auto& w = u.record;
  return {{"id", id},
          {"nominal", w.nominal_text},
          {"class", w.weight_class},
          {"certificate", w.current.certificate_no},
          {"weight_calibration_id", w.current.id},
          {"calibrated_on", to_string(w.current.calibrated_on)},
          {"due_on", to_string(w.current.due_on)},
          {"conventional_mass_g", w.conventional_mass().in_grams().to_string()},
          {"correction_g", w.current.correction.in_grams().to_string()},
          {"uncertainty_g", w.current.uncertainty.in_grams().to_string()},
          {"k", w.current.k.to_string()},
          {"density_kg_m3", fmt::format("{:.0f}", u.density.rho_kg_m3)},
          {"u_density_kg_m3", fmt::format("{:.3g}", u.density.u_kg_m3)},
          {"density_source", u.density.source},
          {"drift_g", u.drift ? json(u.drift->in_grams().to_string()) : json()},
          {"drift_basis", u.drift_basis}};
}

}  // namespace

store::RunRecord record_calibration(store::Database& db, const store::Actor& actor, const CalibrationRunInput& in) {
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::Recorder rec(db.sql(), actor);
  const std::int64_t id = record_calibration_in(db, rec, in);
  rec.commit(tx);
  return *store::find_run(db.sql(), id);
}

namespace {

/// Validates `in` and, with a recorder, computes and records the run; without one (a plan checked before the
/// first reading at the bench) stops once every row, weight and setting has been checked, writing nothing. Rows
/// without a reading (a plan's) skip the reading's own checks.
std::int64_t run_calibration(store::Database& db, store::Recorder* recorder, const CalibrationRunInput& in,
                             const store::RunDetails& extra) {
  const Date on = parse_date(in.on, "--on");
  if (days_between(today_utc(), on) > 1) throw InputError(fmt::format("--on {} is in the future.", in.on));
  if (in.operator_name.empty()) throw InputError("operator: the calibration needs the name of who performed it.");
  validate_free_text(in.operator_name, "operator");
  const stats::Model model = report::parse_model(in.model, "--model");
  density::AirFormula formula = density::AirFormula::cipm2007;
  if (in.air_formula == "oiml-r111")
    formula = density::AirFormula::oiml_r111;
  else if (in.air_formula != "cipm2007")
    throw InputError(fmt::format("--air-formula \"{}\" is not cipm2007 or oiml-r111.", in.air_formula));

  // Environment: all three conditions (the air density follows from them) or none (not measured).
  const auto t = environment_value(in.temperature_c, "--temperature", parse_celsius, density::min_t_c, density::max_t_c,
                                   "degC", "the range plumb accepts for a weighing room");
  const auto p = environment_value(in.pressure_hpa, "--pressure", parse_hectopascals, density::min_pressure_hpa,
                                   density::max_pressure_hpa, "hPa", "the plausible range of air pressure");
  const auto h =
      environment_value(in.humidity_pct, "--humidity", parse_percent_rh, 0.0, 100.0, "%", "relative humidity");
  const int given = (t ? 1 : 0) + (p ? 1 : 0) + (h ? 1 : 0);
  if (given != 0 && given != 3)
    throw InputError(
        fmt::format("--temperature, --pressure and --humidity go together (the air density needs all "
                    "three); {} is missing.",
                    !t   ? "--temperature"
                    : !p ? "--pressure"
                         : "--humidity"));
  // Stored as the exact number in the unit the field names (temperature_c in degC ...), as typed but for the unit.
  const auto exact = [](const std::optional<std::string>& typed, Decimal (*parse)(std::string_view, std::string_view),
                        std::string_view field) -> std::optional<std::string> {
    if (!typed) return std::nullopt;
    return parse(*typed, field).to_string();
  };
  const auto stored_t = exact(in.temperature_c, parse_celsius, "--temperature");
  const auto stored_p = exact(in.pressure_hpa, parse_hectopascals, "--pressure");
  const auto stored_h = exact(in.humidity_pct, parse_percent_rh, "--humidity");
  // The instruments' standard uncertainties, for the air density's u; upper bounds far above any laboratory
  // instrument (beyond them the value is a typing slip).
  const auto u_t = environment_value(in.temperature_u, "--temperature-u", parse_celsius, 0.0, 2.0, "degC",
                                     "the plausible range of a thermometer's standard uncertainty");
  const auto u_p = environment_value(in.pressure_u, "--pressure-u", parse_hectopascals, 0.0, 10.0, "hPa",
                                     "the plausible range of a barometer's standard uncertainty");
  const auto u_h = environment_value(in.humidity_u, "--humidity-u", parse_percent_rh, 0.0, 20.0, "%",
                                     "the plausible range of a hygrometer's standard uncertainty");
  if (given == 0 && (u_t || u_p || u_h)) {
    const auto& [option, text] = u_t   ? std::pair{"--temperature-u", *in.temperature_u}
                                 : u_p ? std::pair{"--pressure-u", *in.pressure_u}
                                       : std::pair{"--humidity-u", *in.humidity_u};
    throw InputError(
        fmt::format("{} {} is given, but the air was not measured: an instrument's uncertainty goes with "
                    "--temperature, --pressure and --humidity.",
                    option, text));
  }
  const auto stored_u_t = exact(in.temperature_u, parse_celsius, "--temperature-u");
  const auto stored_u_p = exact(in.pressure_u, parse_hectopascals, "--pressure-u");
  const auto stored_u_h = exact(in.humidity_u, parse_percent_rh, "--humidity-u");
  std::optional<density::Environment> environment;
  if (given == 3) {
    environment = density::Environment{*t, *p, *h};
    environment->u_t_c = u_t.value_or(0.0);
    environment->u_pressure_hpa = u_p.value_or(0.0);
    environment->u_rh_pct = u_h.value_or(0.0);
    density::validate(*environment);
  }

  std::vector<CalibrationRow> parsed;
  if (!in.parsed_rows) parsed = parse_calibration_csv(in.readings_csv, in.readings_source, in.default_unit);
  const std::vector<CalibrationRow>& rows = in.parsed_rows ? *in.parsed_rows : parsed;
  require_lab(db);
  const auto balance = store::find_balance(db.sql(), in.instrument_id);
  if (!balance) throw InputError(fmt::format("balance \"{}\" is not registered.", in.instrument_id));
  if (!in.supersedes) require_in_service(db, "instrument", balance->id);  // a correction is not a new check
  const auto settings = store::find_calibration_settings(db.sql(), balance->id);
  if (!settings)
    throw InputError(
        fmt::format("balance {} has no calibration settings; set them first with `plumb balance "
                    "set-calibration {} --class ... --decision-rule ... --calibrate-every ...`.",
                    balance->id, balance->id));

  const int allowed = balance->readability.in_grams().significant_scale();
  RunBuilder builder(db, in, on, *balance);
  bool as_found_seen = false;
  for (const auto& r : rows) {
    if (r.reading.text.empty()) {
      // A plan's row: where the reading goes is checked, the reading comes at the bench.
    } else if (r.reading.decimals_in_grams() > allowed)
      throw InputError(
          fmt::format("{} line {} column reading: \"{}\" {} shows more decimals than the readability {} "
                      "of {} allows.",
                      in.readings_source, r.line, r.reading.text, to_string(r.reading.unit),
                      balance->readability.to_string(), balance->id));
    // Capacity is judged on the load (its nominal mass, in load_of), not on the reading: a full-capacity load on
    // a balance that reads high is within its range, and its error of indication is what the run is for.
    else if (r.reading.mass() < ExactMass{})
      throw InputError(
          fmt::format("{} line {} column reading: \"{}\" {} is negative, which no load on the pan can "
                      "show; check the tare and the file.",
                      in.readings_source, r.line, r.reading.text, to_string(r.reading.unit)));
    if (r.stage == "as-found")
      as_found_seen = true;
    else if (!as_found_seen)
      throw InputError(
          fmt::format("{} line {} column stage: as-left readings come before any as-found reading; "
                      "record the balance as found first.",
                      in.readings_source, r.line));
    builder.load_of(r).rows.push_back(&r);
  }
  if (!recorder) return 0;
  store::Recorder& rec = *recorder;
  bool adjusted = false;
  for (const auto& r : rows) adjusted = adjusted || r.stage == "as-left";

  checks::CalibrationInput ci;
  ci.balance = {balance->id, balance->capacity, balance->readability, settings->verification_interval, std::nullopt};
  if (settings->accuracy_class) ci.balance.accuracy_class = r76::parse_accuracy_class(*settings->accuracy_class);
  for (const auto& id : builder.weight_order()) {
    const auto& u = builder.used(id);
    checks::CalibrationWeight w;
    w.id = id;
    w.nominal = u.record.nominal;
    w.conventional_mass = u.record.conventional_mass();
    w.expanded_uncertainty = u.record.current.uncertainty;
    w.coverage_factor = u.record.current.k.to_double();
    w.weight_class = weights::parse_weight_class(u.record.weight_class);
    w.density_kg_m3 = u.density.rho_kg_m3;
    w.u_density_kg_m3 = u.density.u_kg_m3;
    w.density_source = u.density.source;
    w.drift = u.drift;
    w.drift_source = u.drift_basis;
    w.certificate = u.record.current.certificate_no;
    ci.weights.push_back(std::move(w));
  }
  ci.environment = environment;
  ci.air_formula = formula;
  ci.model = model;
  ci.tolerance = tolerance_of(*settings);
  ci.rule = rule_of(*settings);
  ci.as_found = build_set(builder.loads(), "as-found", in.readings_source, model);
  if (adjusted) ci.as_left = build_set(builder.loads(), "as-left", in.readings_source, model);
  const checks::CalibrationResult result = checks::evaluate_calibration(ci);

  const auto& final_set = result.as_left ? *result.as_left : result.as_found;
  store::RunRecord run;
  run.instrument_id = balance->id;
  run.procedure = checks::Procedure::calibration;
  run.performed_on = on;
  run.operator_name = in.operator_name;
  run.supersedes = in.supersedes;
  run.reason = in.reason;
  run.verdict = checks::clear_pass(final_set.overall) ? Verdict::pass : Verdict::fail;
  if (run.verdict == Verdict::pass) run.next_due = add_interval(on, settings->calibrate_every);
  run.results = report::to_json(result);
  run.results["policy_name"] = result.tolerance_name;
  run.results["readability_g"] = balance->readability.in_grams().to_string();
  run.results["capacity_g"] = balance->capacity.in_grams().to_string();
  run.results["model"] = std::string(report::model_key(model));
  run.results["final_stage"] = adjusted ? "as-left" : "as-found";
  run.results["final_state"] = std::string(checks::to_string(final_set.overall));
  run.results["adjusted"] = adjusted;
  run.results["settings"] = {
      {"id", settings->id},
      {"description", describe(*settings)},
      {"accuracy_class", settings->accuracy_class ? json(*settings->accuracy_class) : json()},
      {"e_g", settings->verification_interval ? json(settings->verification_interval->in_grams().to_string()) : json()},
      {"tolerance", settings->tolerance},
      {"decision_rule", settings->decision_rule},
      {"calibrate_every", settings->calibrate_every.to_string()}};
  run.results["environment"] = {
      {"measured", environment.has_value()},
      {"temperature_c", stored_t ? json(*stored_t) : json()},
      {"pressure_hpa", stored_p ? json(*stored_p) : json()},
      {"humidity_pct", stored_h ? json(*stored_h) : json()},
      {"air_method", environment ? std::string(density::to_string(formula)) : std::string("assumed")},
      {"air_density_kg_m3", result.air ? result.air->rho : 1.2},
      {"u_air_density_kg_m3", result.air ? result.air->u : 0.12 / std::sqrt(3.0)},
      {"instrument_u", environment ? json{{"temperature_c", stored_u_t ? json(*stored_u_t) : json()},
                                          {"pressure_hpa", stored_u_p ? json(*stored_u_p) : json()},
                                          {"humidity_pct", stored_u_h ? json(*stored_u_h) : json()}}
                                   : json()},
      {"air_density_u_parts", result.air ? json{{"formula_kg_m3", result.air->u_formula},
                                                {"conditions_kg_m3", result.air->u_conditions},
                                                {"drho_dt_kg_m3_per_K", result.air->dt},
                                                {"drho_dp_kg_m3_per_hPa", result.air->dp},
                                                {"drho_dh_kg_m3_per_pct", result.air->dh}}
                                         : json()},
      {"statement", environment ? air_statement(*result.air, *environment, stored_u_t, stored_u_p, stored_u_h)
                                : std::string("air density not measured: 1.2 kg/m3 +/- 10 % (rectangular) "
                                              "assumed, no buoyancy correction applied")}};
  json trace = json::array();
  for (const auto& id : builder.weight_order()) {
    trace.push_back(weight_trace(id, builder.used(id)));
    run.weights.push_back({id, builder.used(id).record.current.id});
  }
  run.results["weights_used"] = trace;

  store::CalibrationRunDetails details;
  details.settings_id = settings->id;
  details.model = std::string(report::model_key(model));
  details.temperature_c = stored_t;
  details.pressure_hpa = stored_p;
  details.humidity_pct = stored_h;
  details.air_density_kg_m3 = fmt::format("{:.5f}", result.air ? result.air->rho : 1.2);
  details.u_air_density = fmt::format("{:.5f}", result.air ? result.air->u : 0.12 / std::sqrt(3.0));
  details.air_method = environment ? (formula == density::AirFormula::cipm2007 ? "cipm2007" : "oiml-r111") : "assumed";
  details.as_found_state = std::string(checks::key(result.as_found.overall));
  if (result.as_left) details.as_left_state = std::string(checks::key(result.as_left->overall));
  std::map<std::pair<std::string, std::string>, int> numbers;
  std::map<const FileLoad*, int> load_no;
  for (const auto& l : builder.loads()) {
    const int n = ++numbers[{l.stage, l.part}];
    load_no[&l] = n;
    store::CalibrationLoad cl{l.stage, l.part, n, l.combination, l.nominal, l.conventional, {}};
    for (const auto& id : l.weight_ids) cl.weights.push_back({id, builder.used(id).record.current.id});
    details.loads.push_back(std::move(cl));
  }
  int seq = 1;
  for (const auto& r : rows) {
    const FileLoad* owner = nullptr;
    for (const auto& l : builder.loads())
      for (const auto* lr : l.rows)
        if (lr == &r) owner = &l;
    run.readings.push_back(
        {seq, fmt::format("{}/{}/{}/{}/{}", r.stage, r.part, owner->combination, r.position, r.direction), r.reading});
    details.places.push_back({seq, r.stage, r.part, load_no[owner],
                              r.position.empty() ? std::nullopt : std::optional<std::string>(r.position),
                              r.direction.empty() ? std::nullopt : std::optional<std::string>(r.direction)});
    ++seq;
  }

  details.run_id = store::add_run(rec, run, [&](store::RowGroup& group, std::int64_t run_id) {
    details.run_id = run_id;
    store::add_calibration_details(group, details);
    if (extra) extra(group, run_id);
  });
  return details.run_id;
}

}  // namespace

std::int64_t record_calibration_in(store::Database& db, store::Recorder& rec, const CalibrationRunInput& in,
                                   const store::RunDetails& extra) {
  return run_calibration(db, &rec, in, extra);
}

void check_calibration_plan(store::Database& db, const CalibrationRunInput& in) {
  run_calibration(db, nullptr, in, {});
}

json calibration_error_at(const store::RunRecord& run, const std::string& load, bool extrapolate) {
  if (run.procedure != checks::Procedure::calibration)
    throw InputError(
        fmt::format("--at: run {} is a {} check, not a calibration; only a calibration has a fitted "
                    "model.",
                    run.id, checks::to_string(run.procedure)));
  const json& results = run.results;
  const bool left = results.contains("as_left") && !results["as_left"].is_null();
  const json& set = left ? results["as_left"] : results["as_found"];
  const ExactMass at = ExactMass::parse(load, "--at");
  checks::LinearityResult lin;
  lin.fit = report::fit_from_json(set["fit"]);
  const double at_g = at.approx().g();
  if (!lin.fit.interpolates(at_g) && !extrapolate)
    throw InputError(
        fmt::format("--at {} is outside the calibrated range {:.6g} g to {:.6g} g; the error there would "
                    "be an extrapolation (add --extrapolate to see it marked as such).",
                    load, lin.fit.x_min, lin.fit.x_max));
  const auto e =
      checks::error_at(lin, at.approx(), extrapolate ? checks::Extrapolation::mark : checks::Extrapolation::refuse);
  // The calibrated loads on either side of the load asked for: their errors and expanded uncertainties are
  // what the certificate states; the fit's standard error alone leaves out the budget of each load.
  json nearest = json::array();
  const json* below = nullptr;
  const json* above = nullptr;
  static const json no_loads = json::array();
  // Pointers into the stored set itself (value() would hand back a copy that dies after the loop).
  const json& loads = set.contains("loads") ? set["loads"] : no_loads;
  for (const auto& l : loads) {
    const double ref = l.value("reference_g", 0.0);
    if (ref <= at_g && (!below || ref > (*below).value("reference_g", 0.0))) below = &l;
    if (ref >= at_g && (!above || ref < (*above).value("reference_g", 0.0))) above = &l;
  }
  for (const json* l : {below, above}) {
    if (!l || (l == above && above == below)) continue;
    nearest.push_back({{"index", l->value("index", 0)},
                       {"reference_g", l->value("reference_g", 0.0)},
                       {"error_g", l->value("error_g", 0.0)},
                       {"U_g", l->value("U_g", 0.0)},
                       {"k", l->value("k", 0.0)}});
  }
  // The approximation over the range gives an uncertainty at any reading; the fit's standard error does not.
  const auto appr = report::range_approximation_of(set);
  const double r_g = e.indication.g();
  const json over_range = {{"form", appr.form()},
                           {"reading_g", r_g},
                           {"error_g", appr.error_at(r_g)},
                           {"u_g", appr.u_at(r_g)},
                           {"k", appr.k},
                           {"U_g", appr.expanded_at(r_g)},
                           {"error_formula", appr.error_formula()},
                           {"uncertainty_formula", appr.uncertainty_formula()}};
  return {{"run_id", run.id},
          {"instrument", run.instrument_id},
          {"date", to_string(run.performed_on)},
          {"readability_g", results.value("readability_g", "")},
          {"load", at.to_string()},
          {"load_g", e.load.g()},
          {"stage", left ? "as-left" : "as-found"},
          {"model", set["fit"].value("model", "")},
          {"indication_g", e.indication.g()},
          {"error_g", e.error.g()},
          {"se_g", e.se.g()},
          {"extrapolated", e.extrapolated},
          {"over_range", over_range},
          {"nearest_calibrated_loads", nearest}};
}

}  // namespace plumb::app
