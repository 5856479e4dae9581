#include "app/runs/correct.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>
#include <fmt/ranges.h>

#include <algorithm>

#include "app/calibration/record.hpp"
#include "app/certificates/issue.hpp"
#include "app/pipette/record.hpp"
#include "app/registry/fields.hpp"
#include "app/runs/resolve.hpp"
#include "app/weekly_check/record.hpp"
#include "checks/procedure.hpp"
#include "core/condition_units.hpp"
#include "core/errors.hpp"
#include "report/document/layout.hpp"
#include "store/calibration.hpp"
#include "store/pipettes.hpp"
#include "store/repository.hpp"
#include "store/signatures.hpp"
#include "store/status_events.hpp"

namespace plumb::app {
namespace {

/// The stored readings as a readings CSV, so that an unchanged set goes through the same parser again.
std::string readings_as_csv(const store::RunRecord& run) {
  std::string csv = "reading,unit\n";
  for (const auto& r : run.readings) csv += fmt::format("{},{}\n", r.reading.text, to_string(r.reading.unit));
  return csv;
}

std::vector<std::string> split(const std::string& s, char sep) {
  std::vector<std::string> out(1);
  for (const char c : s) {
    if (c == sep) out.emplace_back();
    else out.back() += c;
  }
  return out;
}

/// A calibration's stored readings as its run file: each reading's series is "stage/part/load/position/direction"
/// (app/calibration/record.cpp).
std::string calibration_file_of(const store::RunRecord& run) {
  std::string csv = "stage,part,load,position,direction,reading,unit\n";
  for (const auto& r : run.readings) {
    const auto f = split(r.series, '/');
    if (f.size() != 5) throw std::logic_error(fmt::format("run {}: reading series \"{}\" is not a calibration place",
                                                          run.id, r.series));
    csv += fmt::format("{},{},{},{},{},{},{}\n", f[0], f[1], f[2], f[3], f[4], r.reading.text,
                       to_string(r.reading.unit));
  }
  return csv;
}

/// A pipette run's stored weighings as its weighings file: each series is "<volume> uL channel <n>"
/// (store::pipette_series).
std::string weighings_file_of(const store::RunRecord& run) {
  std::string csv = "volume,channel,reading,unit\n";
  constexpr std::string_view mid = " uL channel ";
  for (const auto& r : run.readings) {
    const auto at = r.series.find(mid);
    if (at == std::string::npos)
      throw std::logic_error(fmt::format("run {}: reading series \"{}\" is not a pipette series", run.id, r.series));
    csv += fmt::format("{}uL,{},{},{}\n", r.series.substr(0, at), r.series.substr(at + mid.size()), r.reading.text,
                       to_string(r.reading.unit));
  }
  return csv;
}

std::vector<std::string> weight_ids_of(const store::RunRecord& run) {
  std::vector<std::string> ids;
  for (const auto& w : run.weights) ids.push_back(w.weight_id);
  return ids;
}

bool same_readings(const store::RunRecord& a, const store::RunRecord& b) {
  if (a.readings.size() != b.readings.size()) return false;
  for (std::size_t i = 0; i < a.readings.size(); ++i)
    if (a.readings[i].reading.text != b.readings[i].reading.text ||
        a.readings[i].reading.unit != b.readings[i].reading.unit || a.readings[i].series != b.readings[i].series)
      return false;
  return true;
}

/// A run condition as stored, with its unit: runs recorded before units were required hold a bare number, which
/// was always in the unit named here.
std::string with_unit(const std::string& stored, const char* unit) {
  const bool bare = !stored.empty() && stored.find_first_not_of("+-0123456789.") == std::string::npos;
  return bare ? stored + unit : stored;
}

std::optional<std::string> with_unit(const std::optional<std::string>& stored, const char* unit) {
  return stored ? std::optional(with_unit(*stored, unit)) : std::nullopt;
}

/// A stored condition as its number in the named unit ("" when absent), so that "20C" and "20.0 degC" compare equal.
std::string condition_value(const std::optional<std::string>& stored, const char* unit,
                            Decimal (*parse)(std::string_view, std::string_view)) {
  if (!stored) return "";
  const Decimal v = parse(with_unit(*stored, unit), "condition");
  return v.rescaled(v.significant_scale()).to_string();
}

/// The run conditions as stored, for telling whether a correction changed any of them.
std::vector<std::string> stored_conditions(store::Database& db, const store::RunRecord& run) {
  switch (run.procedure) {
    case checks::Procedure::repeatability: return {};
    case checks::Procedure::calibration: {
      const auto d = store::find_calibration_details(db.sql(), run.id);
      if (!d) return {};
      return {
          condition_value(d->temperature_c, "C", parse_celsius),
          condition_value(d->pressure_hpa, "hPa", parse_hectopascals),
          condition_value(d->humidity_pct, "%", parse_percent_rh), d->model, d->air_method,
          // The instruments' uncertainties are stored with the results, not in a column.
          run.results.value("environment", nlohmann::json::object()).value("instrument_u", nlohmann::json()).dump()};
    }
    case checks::Procedure::gravimetric: {
      const auto c = store::find_pipette_run_conditions(db.sql(), run.id);
      if (!c) return {};
      // The budget's entered uncertainties are stored with the results, not in a column.
      const auto& e = run.results.value("environment", nlohmann::json::object());
      return {c->balance_id, c->water_temperature_c.to_string(), c->air_pressure_hpa.to_string(),
              c->humidity_pct.to_string(), c->evaporation ? c->evaporation->in_grams().to_string() : "",
              e.value("water_temperature_u_c", nlohmann::json()).dump(),
              e.value("air_density_u_kg_m3", nlohmann::json()).dump()};
    }
  }
  return {};
}

bool same_record(store::Database& db, const store::RunRecord& a, const store::RunRecord& b) {
  return a.performed_on == b.performed_on && a.operator_name == b.operator_name &&
         weight_ids_of(a) == weight_ids_of(b) && same_readings(a, b) &&
         stored_conditions(db, a) == stored_conditions(db, b);
}

/// Which procedures can be corrected is the registry's to say (checks/procedure.hpp).
void require_correctable(const store::RunRecord& run) {
  if (checks::spec(run.procedure).correctable) return;
  std::vector<std::string_view> correctable;
  for (const auto p : checks::all_procedures)
    if (checks::spec(p).correctable) correctable.push_back(checks::to_string(p));
  throw InputError(fmt::format("run {} is a {} run, which `check correct` cannot correct (it corrects runs of: {}).",
                               run.id, checks::to_string(run.procedure), fmt::join(correctable, ", ")));
}

/// A run condition or weight meant for another procedure is refused, not ignored.
void require_options_of(const store::RunRecord& run, const CorrectionInput& in) {
  const auto& mine = checks::spec(run.procedure).options;
  std::vector<std::string> given;
  for (const auto& [name, value] : in.conditions) given.push_back(name);
  if (in.weight_ids) given.emplace_back("weight");
  for (const auto& name : given)
    if (std::find(mine.begin(), mine.end(), name) == mine.end())
      throw InputError(fmt::format("--{} does not apply to run {}, a {} run (its conditions: {}).", name, run.id,
                                   checks::to_string(run.procedure),
                                   mine.empty() ? std::string("none") : fmt::format("--{}", fmt::join(mine, ", --"))));
}

std::optional<std::string> condition(const CorrectionInput& in, const std::string& name) {
  const auto it = in.conditions.find(name);
  return it == in.conditions.end() ? std::nullopt : std::optional(it->second);
}

std::string date_of(const CorrectionInput& in, const store::RunRecord& original) {
  return in.on ? *in.on : to_string(original.performed_on);
}

std::string operator_of(const CorrectionInput& in, const store::RunRecord& original) {
  return in.operator_name ? *in.operator_name : original.operator_name;
}

std::int64_t record_weekly_correction(store::Database& db, store::Recorder& rec, const store::RunRecord& original,
                                      const CorrectionInput& in) {
  CheckInput check;
  check.instrument_id = original.instrument_id;
  check.weight_ids = in.weight_ids ? *in.weight_ids : weight_ids_of(original);
  check.readings_csv = in.readings_csv ? *in.readings_csv : readings_as_csv(original);
  check.readings_source = in.readings_csv ? in.readings_source : fmt::format("readings of run {}", original.id);
  check.default_unit = in.default_unit;
  check.on = date_of(in, original);
  check.operator_name = operator_of(in, original);
  check.supersedes = original.id;
  check.reason = in.reason;
  CheckLookups lookups(db);
  return record_check_in(rec, lookups, check).run_id;
}

std::int64_t record_calibration_correction(store::Database& db, store::Recorder& rec,
                                           const store::RunRecord& original, const CorrectionInput& in) {
  const auto details = store::find_calibration_details(db.sql(), original.id);
  CalibrationRunInput c;
  c.instrument_id = original.instrument_id;
  c.readings_csv = in.readings_csv ? *in.readings_csv : calibration_file_of(original);
  c.readings_source = in.readings_csv ? in.readings_source : fmt::format("run file of run {}", original.id);
  c.default_unit = in.default_unit;
  c.on = date_of(in, original);
  c.operator_name = operator_of(in, original);
  c.temperature_c = details ? with_unit(details->temperature_c, "C") : std::nullopt;
  c.pressure_hpa = details ? with_unit(details->pressure_hpa, "hPa") : std::nullopt;
  c.humidity_pct = details ? with_unit(details->humidity_pct, "%") : std::nullopt;
  if (details && details->air_method == "oiml-r111") c.air_formula = "oiml-r111";
  if (details) c.model = details->model;
  if (auto v = condition(in, "temperature")) c.temperature_c = v;
  if (auto v = condition(in, "pressure")) c.pressure_hpa = v;
  if (auto v = condition(in, "humidity")) c.humidity_pct = v;
  if (auto v = condition(in, "air-formula")) c.air_formula = *v;
  if (auto v = condition(in, "model")) c.model = *v;
  // The instruments' uncertainties live in the results (no column for them): kept unless corrected.
  const auto& entered =
      original.results.value("environment", nlohmann::json::object()).value("instrument_u", nlohmann::json::object());
  const auto kept = [&](const char* key, const char* option, const char* unit) -> std::optional<std::string> {
    if (auto v = condition(in, option)) return v;
    if (!entered.is_object() || !entered.contains(key) || !entered[key].is_string()) return std::nullopt;
    return entered[key].get<std::string>() + unit;
  };
  c.temperature_u = kept("temperature_c", "temperature-u", "C");
  c.pressure_u = kept("pressure_hpa", "pressure-u", "hPa");
  c.humidity_u = kept("humidity_pct", "humidity-u", "%");
  c.supersedes = original.id;
  c.reason = in.reason;
  return record_calibration_in(db, rec, c);
}

std::int64_t record_pipette_correction(store::Database& db, store::Recorder& rec, const store::RunRecord& original,
                                       const CorrectionInput& in) {
  const auto cond = store::find_pipette_run_conditions(db.sql(), original.id);
  if (!cond) throw std::logic_error(fmt::format("run {} has no stored conditions", original.id));
  PipetteCheckInput p;
  p.pipette_id = original.instrument_id;
  p.balance_id = condition(in, "balance").value_or(cond->balance_id);
  p.water_temperature = condition(in, "water-temp").value_or(cond->water_temperature_c.to_string() + "C");
  p.pressure = condition(in, "pressure").value_or(cond->air_pressure_hpa.to_string() + "hPa");
  p.humidity = condition(in, "humidity").value_or(cond->humidity_pct.to_string() + "%");
  p.evaporation = cond->evaporation ? std::optional(cond->evaporation->to_string()) : std::nullopt;
  if (auto v = condition(in, "evaporation")) p.evaporation = v;
  // The budget's entered uncertainties live in the results (no column for them): kept unless corrected.
  const auto stored_u = [&](const char* key, const char* unit) -> std::optional<std::string> {
    const auto& e = original.results.value("environment", nlohmann::json::object());
    if (!e.contains(key) || !e[key].is_number()) return std::nullopt;
    return fmt::format("{}{}", e[key].get<double>(), unit);
  };
  p.water_temperature_u = condition(in, "water-temp-u");
  if (!p.water_temperature_u) p.water_temperature_u = stored_u("water_temperature_u_c", "C");
  p.air_density_u = condition(in, "air-density-u");
  if (!p.air_density_u) p.air_density_u = stored_u("air_density_u_kg_m3", "kg/m3");
  p.readings_csv = in.readings_csv ? *in.readings_csv : weighings_file_of(original);
  p.readings_source = in.readings_csv ? in.readings_source : fmt::format("weighings of run {}", original.id);
  p.default_unit = in.default_unit;
  p.on = date_of(in, original);
  p.operator_name = operator_of(in, original);
  p.supersedes = original.id;
  p.reason = in.reason;
  return record_pipette_check_in(db, rec, p);
}

/// Without a new --layout, a replacement certificate keeps the lab block (address lines, accreditation, logo)
/// and the caution of the certificate it replaces.
nlohmann::json layout_of(const store::CertificateRecord& old, nlohmann::json layout) {
  const auto& c = old.content;
  if (c.contains("lab") && c["lab"].is_object())
    for (const char* key : {"address_lines", "accreditation", "logo_png"})
      if (c["lab"].contains(key)) layout[key] = c["lab"][key];
  if (c.contains("caution")) layout["caution"] = c["caution"];
  return layout;
}

std::int64_t record_correction(store::Database& db, store::Recorder& rec, const store::RunRecord& original,
                               const CorrectionInput& in) {
  switch (original.procedure) {
    case checks::Procedure::repeatability: return record_weekly_correction(db, rec, original, in);
    case checks::Procedure::calibration: return record_calibration_correction(db, rec, original, in);
    case checks::Procedure::gravimetric: return record_pipette_correction(db, rec, original, in);
  }
  throw std::logic_error("unknown procedure");  // not reached: the switch names every Procedure
}

}  // namespace

CorrectionOutcome correct_check(store::Database& db, const store::Actor& actor, const CorrectionInput& in) {
  validate_free_text(in.reason, "--reason", false);
  if (in.reason.find_first_not_of(" \t") == std::string::npos)
    throw InputError("--reason must say why the run is corrected (it is kept with the correction).");
  if (!actor.user_id) throw AccessError("a correction is a signature: it needs an authenticated user.");
  if (!in.readings_csv && !in.on && !in.operator_name && !in.weight_ids && in.conditions.empty())
    throw InputError("nothing to correct: give --readings, --on, --operator, --weight or a run condition; to void a "
                     "run entered in error, use `plumb check void RUN --reason ...`.");
  const auto layout = report::load_layout(in.layout_path);

  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  CorrectionOutcome out;
  out.original = *store::find_run(db.sql(), resolve_run(db, in.run));
  if (out.original.voided)
    throw InputError(fmt::format("run {} is void ({}); a void run is not corrected.", out.original.id,
                                 out.original.voided->reason));
  if (auto newer = superseding_run(db, out.original.id))
    throw InputError(fmt::format("run {} was already corrected by run {}; correct run {} instead.", out.original.id,
                                 newer->id, newer->id));
  require_correctable(out.original);
  require_options_of(out.original, in);

  store::Recorder rec(db.sql(), actor);
  const std::int64_t id = record_correction(db, rec, out.original, in);
  out.correction = *store::find_run(db.sql(), id);
  store::add_signature(rec, db.sql(), "check_runs", fmt::format("id={}", id), "author of this correction");
  // Throwing here still writes nothing: the transaction is rolled back.
  if (same_record(db, out.original, out.correction))
    throw InputError(fmt::format("the correction of run {} changes nothing: the readings, date, operator, weights and "
                                 "conditions are those of the original.",
                                 out.original.id));

  if (auto old = store::certificate_for_run(db.sql(), out.original.id)) {
    out.new_certificate = issue_certificate_in(db, rec, id, in.layout_path ? layout : layout_of(*old, layout), old);
    store::CertificateEvent e;
    e.certificate_id = old->id;
    e.event = "superseded";
    e.by_name = actor.name;
    e.replaced_by = out.new_certificate->id;
    e.reason = in.reason;
    store::add_certificate_event(rec, e);
    out.superseded_certificate = old;
  }
  rec.commit(tx);
  return out;
}

}  // namespace plumb::app
