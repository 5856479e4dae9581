#include "app/registry/in_use.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include <algorithm>

#include "app/pipette/balance_calibration.hpp"
#include "app/registry/lab.hpp"
#include "core/errors.hpp"
#include "report/calibration/json.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

using nlohmann::json;

/// "5K" -> 5 with the unit required: a bare number could be read in another unit.
Decimal in_use_number_with_unit(const std::string& text, std::string_view suffix, std::string_view option) {
  if (text.size() <= suffix.size() || text.compare(text.size() - suffix.size(), suffix.size(), suffix) != 0)
    throw InputError(
        fmt::format("{} \"{}\" must be a number followed by {} (e.g. 2{}).", option, text, suffix, suffix));
  return Decimal::parse(text.substr(0, text.size() - suffix.size()), option);
}

Decimal in_use_within(Decimal v, double lo, double hi, const std::string& text, std::string_view option,
                      std::string_view what) {
  const double x = v.to_double();
  if (x < lo || x > hi) throw InputError(fmt::format("{} \"{}\" is outside {}.", option, text, what));
  return v;
}

ExactMass in_use_mass_option(const std::string& text, std::string_view option, const ExactMass& d, bool at_least_d) {
  const ExactMass m = ExactMass::parse(text, option);
  if (m < ExactMass()) throw InputError(fmt::format("{} \"{}\" is negative.", option, text));
  if (at_least_d && m < d)
    throw InputError(
        fmt::format("{} \"{}\" is finer than the balance's readability d = {}.", option, text, d.to_string()));
  return m;
}

json terms_json(const store::InUseTermsRecord& t) {
  return {{"row", t.id},
          {"rounding_zero_g", t.rounding_zero.in_grams().to_string()},
          {"rounding_load_g", t.rounding_load.in_grams().to_string()},
          {"repeatability_g", t.repeatability.in_grams().to_string()},
          {"temperature_change_k", t.temperature_change_k.to_string()},
          {"sensitivity_ppm_per_k", t.sensitivity_ppm_per_k.to_string()},
          {"sample_density_kg_m3", t.sample_density_kg_m3.to_string()},
          {"sample_density_u_kg_m3", t.sample_density_u_kg_m3.to_string()},
          {"air_density_u_kg_m3", t.air_density_u_kg_m3.to_string()},
          {"drift_ppm", t.drift_ppm.to_string()},
          {"error_corrected", t.error_corrected},
          {"form", t.form},
          {"required_accuracy_pct", t.required_accuracy_pct.to_string()},
          {"safety_factor", t.safety_factor.to_string()},
          {"reason", t.reason},
          {"set_at", t.created_at},
          {"set_by", t.created_by}};
}

/// The latest weekly repeatability check that counts, on or before `on`, with its USP <41> minimum weight.
const store::RunRecord* latest_weekly(const std::vector<store::RunRecord>& runs, Date on) {
  const store::RunRecord* latest = nullptr;
  for (const auto& r : runs)
    if (r.procedure == checks::Procedure::repeatability && r.current() && !(on < r.performed_on) &&
        r.results.contains("min_weight_g") && r.results["min_weight_g"].is_number() &&
        (!latest || latest->performed_on < r.performed_on ||
         (latest->performed_on == r.performed_on && latest->id < r.id)))
      latest = &r;
  return latest;
}

/// The stage a calibration counts by (as left when adjusted) and its approximation over the range.
struct InUseStage {
  std::string key;
  checks::RangeApproximation approximation;
};

InUseStage final_stage_of(const store::RunRecord& run) {
  const json& results = run.results;
  const bool left = results.value("final_stage", "") == "as-left" && results.contains("as_left");
  return {left ? "as-left" : "as-found",
          report::range_approximation_of(left ? results["as_left"] : results["as_found"])};
}

/// U(W) with its terms, coefficients, form, values at four loads and the minimum weight from calibration.
json in_use_figures_json(const checks::InUseUncertainty& u, const checks::RangeApproximation& appr) {
  json rows = json::array();
  for (const auto& term : u.terms)
    rows.push_back({{"source", term.source}, {"u", term.u}, {"relative", term.relative}, {"note", term.note}});
  json at = json::array();
  for (const double f : {0.01, 0.1, 0.5, 1.0}) {
    const double w = f * u.capacity_g;
    at.push_back({{"w_g", w}, {"U_g", u.expanded_at(w)}});
  }
  json out = {{"terms", rows},
              {"alpha_g", u.alpha_g},
              {"beta", u.beta},
              {"k", u.k},
              {"a_g", u.a_g},
              {"b", u.b},
              {"form", std::string(checks::key(u.form))},
              {"error_corrected", u.error_corrected},
              {"formula", u.formula()},
              {"at", at},
              {"minimum_weight_g", u.minimum_weight_g ? json(*u.minimum_weight_g) : json()},
              {"minimum_weight_basis", u.minimum_weight_basis}};
  if (u.minimum_weight_g && *u.minimum_weight_g < appr.reading_min_g)
    out["minimum_weight_note"] = fmt::format(
        "{:.6g} g is below the smallest calibrated load ({:.6g} g): U(W) there comes from the approximation "
        "carried below its calibrated range",
        *u.minimum_weight_g, appr.reading_min_g);
  if (!u.minimum_weight_g)
    out["minimum_weight_absent"] = "no weighing up to the capacity meets the required accuracy with the safety factor";
  return out;
}

/// The USP <41> minimum weight of the latest weekly check on or before `on`, written into out["usp41"].
std::optional<double> usp41_on(store::Database& db, const std::string& balance_id, Date on, json& out) {
  const auto runs = store::runs_of(db.sql(), balance_id);
  const store::RunRecord* weekly = latest_weekly(runs, on);
  if (!weekly) {
    out["usp41"] = {
        {"absent", fmt::format("no weekly repeatability check of {} on or before {}", balance_id, to_string(on))}};
    return std::nullopt;
  }
  const double usp41 = weekly->results["min_weight_g"].get<double>();
  out["usp41"] = {{"run_id", weekly->id}, {"date", to_string(weekly->performed_on)}, {"minimum_weight_g", usp41}};
  return usp41;
}

/// Which minimum weight a weighing procedure must respect (the larger), said in one sentence, with the caution.
json minimum_weight_json(const std::string& balance_id, std::optional<double> from_calibration,
                         std::optional<double> usp41, bool terms_declared) {
  std::string binding, statement;
  if (from_calibration && usp41) {
    binding = *from_calibration >= *usp41 ? "calibration" : "usp41";
    statement = fmt::format(
        "A weighing procedure on {} must weigh at least {:.6g} g: the larger of the minimum weight from calibration "
        "({:.6g} g, EURAMET cg-18 v4.0 with USP <1251>) and the USP <41> minimum weight ({:.6g} g).",
        balance_id, std::max(*from_calibration, *usp41), *from_calibration, *usp41);
  } else if (from_calibration || usp41) {
    binding = from_calibration ? "calibration" : "usp41";
    statement = fmt::format(
        "A weighing procedure on {} must weigh at least {:.6g} g ({}); the other minimum weight is not available.",
        balance_id, from_calibration.value_or(usp41.value_or(0.0)),
        from_calibration ? "minimum weight from calibration, EURAMET cg-18 v4.0 with USP <1251>"
                         : "USP <41> minimum weight from the weekly repeatability");
  } else {
    statement =
        fmt::format("No minimum weight of {} can be stated: {}.", balance_id,
                    terms_declared ? "no calibration or weekly check to draw on"
                                   : "no in-use terms are declared (plumb balance set-in-use) and no weekly check");
  }
  return {{"binding", binding.empty() ? json() : json(binding)},
          {"statement", statement},
          {"caution",
           "Where weighings serve medicine, clinical or food use, local regulations and an accredited calibration "
           "decide the minimum weight; these figures support, not replace, them."}};
}

}  // namespace

store::InUseTermsRecord set_in_use_terms(store::Database& db, const store::Actor& actor, const InUseTermsInput& in) {
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  require_lab(db);
  const auto balance = store::find_balance(db.sql(), in.balance_id);
  if (!balance) throw InputError(fmt::format("balance \"{}\" is not registered.", in.balance_id));
  const ExactMass& d = balance->readability;
  store::InUseTermsRecord t;
  t.balance_id = balance->id;
  t.rounding_zero = in.rounding_zero ? in_use_mass_option(*in.rounding_zero, "--rounding-zero", d, true) : d;
  t.rounding_load = in.rounding_load ? in_use_mass_option(*in.rounding_load, "--rounding-load", d, true) : d;
  if (in.repeatability.empty())
    throw InputError("--repeatability is required: the standard deviation of a single reading in use, e.g. 0.12mg.");
  t.repeatability = in_use_mass_option(in.repeatability, "--repeatability", d, false);
  const auto required = [](const std::string& v, std::string_view option, std::string_view example) {
    if (v.empty()) throw InputError(fmt::format("{} is required, e.g. {}.", option, example));
    return v;
  };
  const std::string dt = required(in.temperature_change, "--temperature-change", "5K");
  t.temperature_change_k = in_use_within(in_use_number_with_unit(dt, "K", "--temperature-change"), 0, 30, dt,
                                         "--temperature-change", "0 K to 30 K");
  const std::string tk = required(in.sensitivity, "--tk", "1.5ppm/K");
  t.sensitivity_ppm_per_k =
      in_use_within(in_use_number_with_unit(tk, "ppm/K", "--tk"), 0, 100, tk, "--tk", "0 to 100 ppm/K");
  t.sample_density_kg_m3 = in_use_within(in_use_number_with_unit(in.sample_density, "kg/m3", "--sample-density"), 100,
                                         25000, in.sample_density, "--sample-density", "100 kg/m3 to 25000 kg/m3");
  t.sample_density_u_kg_m3 = in_use_within(in_use_number_with_unit(in.sample_density_u, "kg/m3", "--sample-density-u"),
                                           0, t.sample_density_kg_m3.to_double() / 2, in.sample_density_u,
                                           "--sample-density-u", "0 to half the sample density");
  const std::string au = required(in.air_density_u, "--air-density-u", "0.05kg/m3");
  t.air_density_u_kg_m3 = in_use_within(in_use_number_with_unit(au, "kg/m3", "--air-density-u"), 0, 0.2, au,
                                        "--air-density-u", "0 to 0.2 kg/m3");
  const std::string dr = required(in.drift, "--drift", "10ppm");
  t.drift_ppm = in_use_within(in_use_number_with_unit(dr, "ppm", "--drift"), 0, 10000, dr, "--drift", "0 to 10000 ppm");
  t.error_corrected = in.error_corrected;
  if (in.form != "linear" && in.form != "quadratic-sum")
    throw InputError(fmt::format("--form \"{}\" is not linear or quadratic-sum.", in.form));
  t.form = in.form;
  const std::string ra = required(in.required_accuracy, "--required-accuracy", "0.1%");
  const Decimal a = in_use_number_with_unit(ra, "%", "--required-accuracy");
  if (a.to_double() <= 0 || a.to_double() >= 100)
    throw InputError(fmt::format("--required-accuracy \"{}\" must be above 0 % and below 100 %.", ra));
  t.required_accuracy_pct = a;
  const std::string sf = required(in.safety_factor, "--safety-factor", "2");
  t.safety_factor = in_use_within(Decimal::parse(sf, "--safety-factor"), 1, 100, sf, "--safety-factor", "1 to 100");
  t.reason = in.reason;
  store::Recorder rec(db.sql(), actor);
  t.id = store::add_in_use_terms(rec, t);
  rec.commit(tx);
  auto stored = store::current_in_use_terms(db.sql(), t.balance_id);
  if (!stored) throw StorageError(fmt::format("the in-use terms of {} were not stored.", t.balance_id));
  return *stored;
}

checks::InUseTerms in_use_terms_of(const store::InUseTermsRecord& r) {
  checks::InUseTerms t;
  t.rounding_zero = r.rounding_zero.approx();
  t.rounding_load = r.rounding_load.approx();
  t.repeatability = r.repeatability.approx();
  t.temperature_range_k = r.temperature_change_k.to_double();
  t.sensitivity_per_k = r.sensitivity_ppm_per_k.to_double() * 1e-6;
  t.sample_density_kg_m3 = r.sample_density_kg_m3.to_double();
  t.sample_density_u_kg_m3 = r.sample_density_u_kg_m3.to_double();
  t.air_density_u_kg_m3 = r.air_density_u_kg_m3.to_double();
  t.drift_relative = r.drift_ppm.to_double() * 1e-6;
  t.error_corrected = r.error_corrected;
  t.form = r.form == "quadratic-sum" ? checks::InUseForm::quadratic_sum : checks::InUseForm::linear;
  t.required_relative = r.required_accuracy_pct.to_double() / 100.0;
  t.safety_factor = r.safety_factor.to_double();
  return t;
}

json balance_in_use(store::Database& db, const std::string& balance_id, Date on) {
  const auto balance = store::find_balance(db.sql(), balance_id);
  if (!balance) throw InputError(fmt::format("balance \"{}\" is not registered.", balance_id));
  json out{{"balance", balance->id},
           {"on", to_string(on)},
           {"capacity_g", balance->capacity.in_grams().to_string()},
           {"readability_g", balance->readability.in_grams().to_string()}};
  json history = json::array();
  for (const auto& t : store::in_use_terms_history(db.sql(), balance->id)) history.push_back(terms_json(t));
  out["terms_history"] = history;
  const auto terms = store::current_in_use_terms(db.sql(), balance->id);
  out["terms"] = terms ? terms_json(*terms) : json();

  std::optional<double> from_calibration;
  const auto lookup = balance_calibration_on(db, balance->id, on);
  if (!lookup.calibration) {
    out["calibration"] = {{"absent", lookup.absent_reason}};
  } else {
    const auto& use = *lookup.calibration;
    const auto run = store::find_run(db.sql(), use.run_id);
    if (!run)
      throw StorageError(fmt::format("calibration run {} of balance {} is not stored.", use.run_id, balance->id));
    const InUseStage stage = final_stage_of(*run);
    out["calibration"] = {{"run_id", use.run_id},
                          {"date", to_string(use.performed_on)},
                          {"certificate", use.certificate},
                          {"stage", stage.key},
                          {"range_approximation", report::to_json(stage.approximation)}};
    if (terms) {
      const auto u =
          checks::in_use_uncertainty(stage.approximation, in_use_terms_of(*terms), balance->capacity.approx());
      out["in_use"] = in_use_figures_json(u, stage.approximation);
      from_calibration = u.minimum_weight_g;
    }
  }
  const auto usp41 = usp41_on(db, balance->id, on, out);
  out["minimum_weight"] = minimum_weight_json(balance->id, from_calibration, usp41, terms.has_value());
  return out;
}

json certificate_in_use(store::Database& db, const store::RunRecord& run, Date on) {
  const auto balance = store::find_balance(db.sql(), run.instrument_id);
  if (!balance) return json();  // not a balance: nothing of normal use to state
  const auto terms = store::current_in_use_terms(db.sql(), balance->id);
  json out{{"balance", balance->id}, {"on", to_string(on)}, {"capacity_g", balance->capacity.in_grams().to_string()}};
  if (!terms) {
    out["terms"] = json();
    out["statement"] = fmt::format(
        "No terms of normal use are declared for {}: the uncertainty of a weighing result in use and the minimum "
        "weight from calibration are not stated (plumb balance set-in-use).",
        balance->id);
    return out;
  }
  const InUseStage stage = final_stage_of(run);
  const auto u = checks::in_use_uncertainty(stage.approximation, in_use_terms_of(*terms), balance->capacity.approx());
  out["terms"] = terms_json(*terms);
  out["stage"] = stage.key;
  out["in_use"] = in_use_figures_json(u, stage.approximation);
  const auto usp41 = usp41_on(db, balance->id, on, out);
  out["minimum_weight"] = minimum_weight_json(balance->id, u.minimum_weight_g, usp41, true);
  out["sources"] =
      "EURAMET cg-18 version 4.0 (2015), Guidelines on the Calibration of Non-Automatic Weighing Instruments: the "
      "approximation of the error and its uncertainty over the range, the uncertainty of a weighing result in use "
      "and its global form; the minimum weight from calibration with the required relative accuracy and safety "
      "factor as USP <1251> uses it; the USP <41> minimum weight from the weekly repeatability.";
  return out;
}

}  // namespace plumb::app
