#include "store/calibration.hpp"

#include <SQLiteCpp/Statement.h>

#include "store/columns.hpp"
#include "store/repository.hpp"

namespace plumb::store {
namespace {

using nlohmann::json;

Value text_or_null(const std::optional<std::string>& s) { return s ? Value(*s) : Value(); }
std::optional<std::string> optional_text(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return c.getString();
}
}  // namespace

namespace {

constexpr const char* settings_select =
    "SELECT id, instrument_id, accuracy_class, verification_interval_g, tolerance, lab_limit_g, lab_percent, "
    "decision_rule, calibrate_every, effective_on, created_at, created_by FROM balance_calibration_settings";

CalibrationSettings settings_from(SQLite::Statement& q) {
  CalibrationSettings s;
  s.id = q.getColumn(0).getInt64();
  s.instrument_id = q.getColumn(1).getString();
  s.accuracy_class = optional_text(q.getColumn(2));
  if (!q.getColumn(3).isNull()) s.verification_interval = stored_grams(q.getColumn(3));
  s.tolerance = q.getColumn(4).getString();
  if (!q.getColumn(5).isNull()) s.lab_limit = stored_grams(q.getColumn(5));
  if (!q.getColumn(6).isNull()) s.lab_percent = Decimal::parse(q.getColumn(6).getString());
  s.decision_rule = q.getColumn(7).getString();
  s.calibrate_every = Interval::parse(q.getColumn(8).getString());
  s.effective_on = parse_date(q.getColumn(9).getString());
  s.created_at = q.getColumn(10).getString();
  s.created_by = q.getColumn(11).getString();
  return s;
}

}  // namespace

std::optional<CalibrationSettings> find_calibration_settings(SQLite::Database& db, const std::string& instrument_id) {
  SQLite::Statement q(db, std::string(settings_select) + " WHERE instrument_id = ? ORDER BY id DESC LIMIT 1");
  q.bind(1, instrument_id);
  if (!q.executeStep()) return std::nullopt;
  return settings_from(q);
}

std::map<std::string, CalibrationSettings> all_current_calibration_settings(SQLite::Database& db) {
  SQLite::Statement q(db, std::string(settings_select) +
                              " WHERE id IN (SELECT max(id) FROM balance_calibration_settings GROUP BY instrument_id)");
  std::map<std::string, CalibrationSettings> out;
  while (q.executeStep()) {
    CalibrationSettings s = settings_from(q);
    std::string id = s.instrument_id;
    out.emplace(std::move(id), std::move(s));
  }
  return out;
}

std::int64_t add_calibration_settings(Recorder& rec, const CalibrationSettings& s) {
  return rec.insert(
      "balance_calibration_settings",
      {{"instrument_id", s.instrument_id},
       {"accuracy_class", text_or_null(s.accuracy_class)},
       {"verification_interval_g", s.verification_interval ? Value(s.verification_interval->in_grams().to_string())
                                                           : Value()},
       {"tolerance", s.tolerance},
       {"lab_limit_g", s.lab_limit ? Value(s.lab_limit->in_grams().to_string()) : Value()},
       {"lab_percent", s.lab_percent ? Value(s.lab_percent->to_string()) : Value()},
       {"decision_rule", s.decision_rule},
       {"calibrate_every", s.calibrate_every.to_string()},
       {"effective_on", to_string(s.effective_on)},
       {"created_at", rec.now()},
       {"created_by", rec.actor().name}},
      {"id"}, "calibration settings");
}

void add_calibration_details(RowGroup& group, const CalibrationRunDetails& d) {
  group.insert("calibration_runs",
             {{"run_id", d.run_id},
              {"settings_id", d.settings_id},
              {"model", d.model},
              {"temperature_c", text_or_null(d.temperature_c)},
              {"pressure_hpa", text_or_null(d.pressure_hpa)},
              {"humidity_pct", text_or_null(d.humidity_pct)},
              {"air_density_kg_m3", d.air_density_kg_m3},
              {"u_air_density", d.u_air_density},
              {"air_method", d.air_method},
              {"as_found_state", d.as_found_state},
              {"as_left_state", text_or_null(d.as_left_state)}},
             {"run_id"});
  for (const auto& l : d.loads) {
    group.insert("calibration_loads",
               {{"run_id", d.run_id},
                {"stage", l.stage},
                {"part", l.part},
                {"load_no", l.load_no},
                {"combination", l.combination},
                {"nominal_g", l.nominal.in_grams().to_string()},
                {"conventional_g", l.conventional.in_grams().to_string()}},
               {"run_id", "stage", "part", "load_no"});
    int item = 1;
    for (const auto& w : l.weights)
      group.insert("calibration_load_weights",
                 {{"run_id", d.run_id},
                  {"stage", l.stage},
                  {"part", l.part},
                  {"load_no", l.load_no},
                  {"item", item++},
                  {"weight_id", w.weight_id},
                  {"weight_calibration_id", w.weight_calibration_id}},
                 {"run_id", "stage", "part", "load_no", "item"});
  }
  for (const auto& p : d.places)
    group.insert("calibration_readings",
               {{"run_id", d.run_id},
                {"seq", p.seq},
                {"stage", p.stage},
                {"part", p.part},
                {"load_no", p.load_no},
                {"position", text_or_null(p.position)},
                {"direction", text_or_null(p.direction)}},
               {"run_id", "seq"});
}

std::optional<CalibrationRunDetails> find_calibration_details(SQLite::Database& db, std::int64_t run_id) {
  SQLite::Statement q(
      db,
      "SELECT settings_id, model, temperature_c, pressure_hpa, humidity_pct, air_density_kg_m3, "
      "u_air_density, air_method, as_found_state, as_left_state FROM calibration_runs WHERE run_id = ?");
  q.bind(1, run_id);
  if (!q.executeStep()) return std::nullopt;
  CalibrationRunDetails d;
  d.run_id = run_id;
  d.settings_id = q.getColumn(0).getInt64();
  d.model = q.getColumn(1).getString();
  d.temperature_c = optional_text(q.getColumn(2));
  d.pressure_hpa = optional_text(q.getColumn(3));
  d.humidity_pct = optional_text(q.getColumn(4));
  d.air_density_kg_m3 = q.getColumn(5).getString();
  d.u_air_density = q.getColumn(6).getString();
  d.air_method = q.getColumn(7).getString();
  d.as_found_state = q.getColumn(8).getString();
  d.as_left_state = optional_text(q.getColumn(9));
  SQLite::Statement l(db,
                      "SELECT stage, part, load_no, combination, nominal_g, conventional_g FROM calibration_loads "
                      "WHERE run_id = ? ORDER BY stage DESC, part, load_no");
  l.bind(1, run_id);
  while (l.executeStep()) {
    CalibrationLoad load;
    load.stage = l.getColumn(0).getString();
    load.part = l.getColumn(1).getString();
    load.load_no = l.getColumn(2).getInt();
    load.combination = l.getColumn(3).getString();
    load.nominal = stored_grams(l.getColumn(4));
    load.conventional = stored_grams(l.getColumn(5));
    SQLite::Statement w(db,
                        "SELECT weight_id, weight_calibration_id FROM calibration_load_weights WHERE run_id = ? AND "
                        "stage = ? AND part = ? AND load_no = ? ORDER BY item");
    w.bind(1, run_id);
    w.bind(2, load.stage);
    w.bind(3, load.part);
    w.bind(4, load.load_no);
    while (w.executeStep()) load.weights.push_back({w.getColumn(0).getString(), w.getColumn(1).getInt64()});
    d.loads.push_back(std::move(load));
  }
  SQLite::Statement p(
      db,
      "SELECT seq, stage, part, load_no, position, direction FROM calibration_readings WHERE run_id = ? "
      "ORDER BY seq");
  p.bind(1, run_id);
  while (p.executeStep())
    d.places.push_back({p.getColumn(0).getInt(), p.getColumn(1).getString(), p.getColumn(2).getString(),
                        p.getColumn(3).getInt(), optional_text(p.getColumn(4)), optional_text(p.getColumn(5))});
  return d;
}

std::vector<WeightCalibration> weight_calibrations_until(SQLite::Database& db, const std::string& weight_id, Date on) {
  SQLite::Statement q(db,
                      "SELECT id FROM weight_calibrations WHERE weight_id = ? AND calibrated_on <= ? "
                      "ORDER BY calibrated_on, id");
  q.bind(1, weight_id);
  q.bind(2, to_string(on));
  std::vector<WeightCalibration> out;
  while (q.executeStep())
    if (auto c = find_weight_calibration(db, q.getColumn(0).getInt64())) out.push_back(*c);
  return out;
}

std::optional<RunRecord> latest_run_by_procedure(SQLite::Database& db, const std::string& instrument_id,
                                                 checks::Procedure procedure, bool include) {
  SQLite::Statement q(db, std::string("SELECT id FROM check_runs WHERE instrument_id = ? AND procedure ") +
                              (include ? "=" : "<>") +
                              " ? AND id NOT IN (SELECT supersedes FROM check_runs WHERE supersedes IS NOT NULL) "
                              "AND id NOT IN (SELECT run_id FROM run_voids) "
                              "ORDER BY performed_on DESC, id DESC LIMIT 1");
  q.bind(1, instrument_id);
  q.bind(2, std::string(checks::to_string(procedure)));
  if (!q.executeStep()) return std::nullopt;
  return find_run(db, q.getColumn(0).getInt64());
}

}  // namespace plumb::store
