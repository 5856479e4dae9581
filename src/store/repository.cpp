#include "store/repository.hpp"

#include <SQLiteCpp/Statement.h>
#include <fmt/format.h>

#include <algorithm>
#include <map>

#include "core/errors.hpp"
#include "core/natural_order.hpp"
#include "store/columns.hpp"
#include "store/instrument_versions.hpp"

namespace plumb::store {
namespace {

using nlohmann::json;


constexpr const char* weight_select =
    "SELECT w.id, w.nominal_text, w.nominal_g, w.weight_class, w.density_kg_m3, c.id, c.certificate_no, "
    "c.correction_g, c.uncertainty_g, c.coverage_k, c.calibrated_on, c.due_on FROM weights w "
    "JOIN weight_calibrations c ON c.id = (SELECT id FROM weight_calibrations WHERE weight_id = w.id "
    "ORDER BY calibrated_on DESC, id DESC LIMIT 1)";

WeightRecord weight_from(SQLite::Statement& q) {
  WeightRecord w;
  w.id = q.getColumn(0).getString();
  w.nominal_text = q.getColumn(1).getString();
  w.nominal = stored_grams(q.getColumn(2));
  w.weight_class = q.getColumn(3).getString();
  if (!q.getColumn(4).isNull()) w.density_kg_m3 = Decimal::parse(q.getColumn(4).getString());
  w.current.id = q.getColumn(5).getInt64();
  w.current.certificate_no = q.getColumn(6).getString();
  w.current.correction = stored_grams(q.getColumn(7));
  w.current.uncertainty = stored_grams(q.getColumn(8));
  w.current.k = Decimal::parse(q.getColumn(9).getString());
  w.current.calibrated_on = stored_date(q.getColumn(10));
  w.current.due_on = stored_date(q.getColumn(11));
  return w;
}

// A balance with the attributes in force on the date bound to ?1 (schema/006_lifecycle.sql): the latest
// version dated on or before it, else the registration row.
const std::string& balance_select() {
  static const std::string sql =
      "SELECT i.id, CASE WHEN v.id IS NULL THEN i.location ELSE v.location END, coalesce(v.check_every, "
      "i.check_every), i.created_on, b.capacity_g, b.readability_g, CASE WHEN v.id IS NULL THEN b.smallest_net_g "
      "ELSE v.smallest_net_g END, coalesce(v.policy, b.policy), CASE WHEN v.id IS NULL THEN b.max_bias_g ELSE "
      "v.max_bias_g END, CASE WHEN v.id IS NULL THEN b.max_sd_g ELSE v.max_sd_g END, v.min_readings, "
      "coalesce(v.maker, n.maker, ''), coalesce(v.model, n.model, ''), coalesce(v.serial_no, n.serial_no, ''), "
      "coalesce(v.asset_tag, n.asset_tag, '') FROM instruments i JOIN balances b ON b.instrument_id = i.id "
      "LEFT JOIN instrument_identities n ON n.instrument_id = i.id" +
      version_join("v", "i.id", 1);
  return sql;
}

BalanceRecord balance_from(SQLite::Statement& q) {
  BalanceRecord b;
  b.id = q.getColumn(0).getString();
  b.location = q.getColumn(1).getString();
  b.every = Interval::parse(q.getColumn(2).getString());
  b.created_on = stored_date(q.getColumn(3));
  b.capacity = stored_grams(q.getColumn(4));
  b.readability = stored_grams(q.getColumn(5));
  b.smallest_net = stored_grams_or_none(q.getColumn(6));
  b.policy.kind = q.getColumn(7).getString() == "lab" ? TolerancePolicy::Kind::lab : TolerancePolicy::Kind::usp41;
  b.policy.max_bias = stored_grams_or_none(q.getColumn(8));
  b.policy.max_sd = stored_grams_or_none(q.getColumn(9));
  if (!q.getColumn(10).isNull()) b.policy.min_readings = q.getColumn(10).getInt();
  b.identity = {q.getColumn(11).getString(), q.getColumn(12).getString(), q.getColumn(13).getString(),
                q.getColumn(14).getString()};
  return b;
}

constexpr const char* run_select =
    "SELECT id, instrument_id, procedure, performed_on, operator, results_json, verdict, next_due, supersedes, "
    "reason, recorded_at, os_user, (SELECT min(s.id) FROM check_runs s WHERE s.supersedes = check_runs.id), "
    "(SELECT reason FROM run_voids v WHERE v.run_id = check_runs.id), (SELECT by_name FROM run_voids v WHERE "
    "v.run_id = check_runs.id), (SELECT recorded_at FROM run_voids v WHERE v.run_id = check_runs.id) "
    "FROM check_runs";

RunRecord run_from(SQLite::Statement& q) {
  RunRecord r;
  r.id = q.getColumn(0).getInt64();
  r.instrument_id = q.getColumn(1).getString();
  r.procedure = stored_procedure(q.getColumn(2));
  r.performed_on = stored_date(q.getColumn(3));
  r.operator_name = q.getColumn(4).getString();
  r.results = json::parse(q.getColumn(5).getString());
  r.verdict = q.getColumn(6).getString() == "pass" ? Verdict::pass : Verdict::fail;
  if (!q.getColumn(7).isNull()) r.next_due = stored_date(q.getColumn(7));
  if (!q.getColumn(8).isNull()) r.supersedes = q.getColumn(8).getInt64();
  if (!q.getColumn(9).isNull()) r.reason = q.getColumn(9).getString();
  r.recorded_at = q.getColumn(10).getString();
  r.os_user = q.getColumn(11).getString();
  if (!q.getColumn(12).isNull()) r.superseded_by = q.getColumn(12).getInt64();
  if (!q.getColumn(13).isNull())
    r.voided = RunVoid{q.getColumn(13).getString(), q.getColumn(14).getString(), q.getColumn(15).getString()};
  return r;
}

void load_run_details(SQLite::Database& db, RunRecord& r, bool with_readings) {
  SQLite::Statement w(db, "SELECT weight_id, weight_calibration_id FROM run_weights WHERE run_id = ? ORDER BY position");
  w.bind(1, r.id);
  while (w.executeStep()) r.weights.push_back({w.getColumn(0).getString(), w.getColumn(1).getInt64()});
  if (!with_readings) return;
  SQLite::Statement q(db, "SELECT seq, series, text, unit, units, scale FROM readings WHERE run_id = ? ORDER BY seq");
  q.bind(1, r.id);
  while (q.executeStep()) {
    StoredReading s;
    s.seq = q.getColumn(0).getInt();
    s.series = q.getColumn(1).getString();
    s.reading.text = q.getColumn(2).getString();
    s.reading.unit = parse_mass_unit(q.getColumn(3).getString());
    s.reading.value = Decimal(q.getColumn(4).getInt64(), q.getColumn(5).getInt());
    r.readings.push_back(std::move(s));
  }
}

}  // namespace

std::optional<LabRecord> find_lab(SQLite::Database& db) {
  SQLite::Statement q(db, "SELECT name, created_at FROM lab WHERE id = 1");
  if (!q.executeStep()) return std::nullopt;
  return LabRecord{q.getColumn(0).getString(), q.getColumn(1).getString()};
}

void add_lab(Recorder& rec, const std::string& name) {
  rec.insert("lab", {{"id", 1}, {"name", name}, {"created_at", rec.now()}, {"created_by", rec.actor().name}}, {"id"});
}

std::optional<WeightRecord> find_weight(SQLite::Database& db, const std::string& id) {
  SQLite::Statement q(db, std::string(weight_select) + " WHERE w.id = ?");
  q.bind(1, id);
  if (!q.executeStep()) return std::nullopt;
  return weight_from(q);
}

std::optional<WeightCalibration> find_weight_calibration(SQLite::Database& db, std::int64_t id) {
  SQLite::Statement q(db,
                      "SELECT id, certificate_no, correction_g, uncertainty_g, coverage_k, calibrated_on, due_on "
                      "FROM weight_calibrations WHERE id = ?");
  q.bind(1, id);
  if (!q.executeStep()) return std::nullopt;
  WeightCalibration c;
  c.id = q.getColumn(0).getInt64();
  c.certificate_no = q.getColumn(1).getString();
  c.correction = stored_grams(q.getColumn(2));
  c.uncertainty = stored_grams(q.getColumn(3));
  c.k = Decimal::parse(q.getColumn(4).getString());
  c.calibrated_on = stored_date(q.getColumn(5));
  c.due_on = stored_date(q.getColumn(6));
  return c;
}

std::vector<WeightRecord> list_weights(SQLite::Database& db) {
  SQLite::Statement q(db, weight_select);
  std::vector<WeightRecord> out;
  while (q.executeStep()) out.push_back(weight_from(q));
  // A set of weights reads in mass order (W1MG, W10G, W100G), then by id; masses compare exactly.
  std::sort(out.begin(), out.end(), [](const WeightRecord& a, const WeightRecord& b) {
    if (a.nominal != b.nominal) return a.nominal < b.nominal;
    return compare_natural(a.id, b.id) < 0;
  });
  return out;
}

std::int64_t add_weight(Recorder& rec, const WeightRecord& w) {
  rec.insert("weights",
             {{"id", w.id},
              {"nominal_text", w.nominal_text},
              {"nominal_g", w.nominal.in_grams().to_string()},
              {"weight_class", w.weight_class},
              {"density_kg_m3", w.density_kg_m3 ? Value(w.density_kg_m3->to_string()) : Value()},
              {"created_at", rec.now()},
              {"created_by", rec.actor().name}},
             {"id"});
  return add_weight_calibration(rec, w.id, w.current);
}

std::int64_t add_weight_calibration(Recorder& rec, const std::string& weight_id, const WeightCalibration& c) {
  return rec.insert("weight_calibrations",
             {{"weight_id", weight_id},
              {"certificate_no", c.certificate_no},
              {"correction_g", c.correction.in_grams().to_string()},
              {"uncertainty_g", c.uncertainty.in_grams().to_string()},
              {"coverage_k", c.k.to_string()},
              {"calibrated_on", to_string(c.calibrated_on)},
              {"due_on", to_string(c.due_on)},
              {"created_at", rec.now()},
              {"created_by", rec.actor().name}},
             {"id"});
}

bool instrument_exists(SQLite::Database& db, const std::string& id) {
  SQLite::Statement q(db, "SELECT 1 FROM instruments WHERE id = ?");
  q.bind(1, id);
  return q.executeStep();
}

std::optional<BalanceRecord> find_balance(SQLite::Database& db, const std::string& id) {
  SQLite::Statement q(db, balance_select() + " WHERE i.id = ?2");
  q.bind(1, latest_attributes_date);
  q.bind(2, id);
  if (!q.executeStep()) return std::nullopt;
  return balance_from(q);
}

std::optional<BalanceRecord> find_balance_on(SQLite::Database& db, const std::string& id, Date on) {
  SQLite::Statement q(db, balance_select() + " WHERE i.id = ?2");
  q.bind(1, to_string(on));
  q.bind(2, id);
  if (!q.executeStep()) return std::nullopt;
  return balance_from(q);
}

std::vector<BalanceRecord> list_balances(SQLite::Database& db) {
  SQLite::Statement q(db, balance_select() + " ORDER BY i.id COLLATE natural_id");
  q.bind(1, latest_attributes_date);
  std::vector<BalanceRecord> out;
  while (q.executeStep()) out.push_back(balance_from(q));
  return out;
}

void add_balance(Recorder& rec, const BalanceRecord& b) {
  rec.insert("instruments",
             {{"id", b.id},
              {"kind", "balance"},
              {"location", b.location},
              {"check_every", b.every.to_string()},
              {"created_on", to_string(b.created_on)},
              {"created_at", rec.now()},
              {"created_by", rec.actor().name}},
             {"id"});
  rec.insert("balances",
             {{"instrument_id", b.id},
              {"capacity_g", b.capacity.in_grams().to_string()},
              {"readability_g", b.readability.in_grams().to_string()},
              {"smallest_net_g", grams_value(b.smallest_net)},
              {"policy", b.policy.key()},
              {"max_bias_g", grams_value(b.policy.max_bias)},
              {"max_sd_g", grams_value(b.policy.max_sd)}},
             {"instrument_id"});
  if (!b.identity.empty()) add_instrument_identity(rec, b.id, b.identity);
}

PreparedGroup prepare_run(Recorder& rec, RunRecord&& run, std::int64_t& id, const RunDetails& details) {
  // One audit record for the run with its weights and readings: what the operator recorded, as one entry.
  return rec.prepare_together(run.reason, [&](RowGroup& group) {
    // Built field by field: a braced list would copy the stored results (about 1 KB) once more.
    Row run_row;
    run_row.reserve(12);
    run_row.push_back({"instrument_id", std::move(run.instrument_id)});
    run_row.push_back({"procedure", std::string(checks::to_string(run.procedure))});
    run_row.push_back({"performed_on", to_string(run.performed_on)});
    run_row.push_back({"operator", std::move(run.operator_name)});
    run_row.push_back({"results_json", run.results_text.empty() ? run.results.dump() : std::move(run.results_text)});
    run_row.push_back({"verdict", to_string(run.verdict)});
    run_row.push_back({"next_due", run.next_due ? Value(to_string(*run.next_due)) : Value()});
    run_row.push_back({"supersedes", run.supersedes ? Value(*run.supersedes) : Value()});
    run_row.push_back({"reason", run.reason.empty() ? Value() : Value(run.reason)});
    run_row.push_back({"recorded_at", rec.now()});
    run_row.push_back({"os_user", rec.actor().os_user});
    id = group.insert("check_runs", std::move(run_row), {"id"});
    int position = 1;
    for (const auto& w : run.weights)
      group.insert("run_weights",
                   {{"run_id", id},
                    {"position", position++},
                    {"weight_id", w.weight_id},
                    {"weight_calibration_id", w.weight_calibration_id}},
                   {"run_id", "position"});
    // Built field by field: a braced list would copy every text twice, for each of a million readings.
    std::vector<Row> readings(run.readings.size());
    for (std::size_t i = 0; i < run.readings.size(); ++i) {
      StoredReading& r = run.readings[i];
      Row& row = readings[i];
      row.reserve(7);
      row.push_back({"run_id", id});
      row.push_back({"seq", r.seq});
      row.push_back({"series", std::move(r.series)});
      row.push_back({"text", std::move(r.reading.text)});
      row.push_back({"unit", to_string(r.reading.unit)});
      row.push_back({"units", r.reading.value.units()});
      row.push_back({"scale", r.reading.value.scale()});
    }
    group.insert_rows("readings", std::move(readings));
    if (details) details(group, id);
  });
}

std::int64_t add_run(Recorder& rec, const RunRecord& run, const RunDetails& details) {
  std::int64_t id = 0;
  rec.write(prepare_run(rec, RunRecord(run), id, details));
  return id;
}

std::optional<RunRecord> find_run(SQLite::Database& db, std::int64_t id) {
  SQLite::Statement q(db, std::string(run_select) + " WHERE id = ?");
  q.bind(1, id);
  if (!q.executeStep()) return std::nullopt;
  RunRecord r = run_from(q);
  load_run_details(db, r, true);
  return r;
}

std::optional<std::int64_t> last_run_id(SQLite::Database& db) {
  SQLite::Statement q(db, "SELECT max(id) FROM check_runs");
  if (!q.executeStep() || q.getColumn(0).isNull()) return std::nullopt;
  return q.getColumn(0).getInt64();
}

std::vector<RunRecord> runs_of(SQLite::Database& db, const std::string& instrument_id, bool with_readings) {
  SQLite::Statement q(db, std::string(run_select) + " WHERE instrument_id = ? ORDER BY performed_on, id");
  q.bind(1, instrument_id);
  std::vector<RunRecord> out;
  while (q.executeStep()) out.push_back(run_from(q));
  if (with_readings) {
    for (auto& r : out) load_run_details(db, r, true);
    return out;
  }
  // The weights of every run in one statement, prepared once: a history of hundreds of runs is read in two.
  SQLite::Statement w(db,
                      "SELECT w.run_id, w.weight_id, w.weight_calibration_id FROM run_weights w JOIN check_runs r ON "
                      "r.id = w.run_id WHERE r.instrument_id = ? ORDER BY w.run_id, w.position");
  w.bind(1, instrument_id);
  std::map<std::int64_t, std::vector<RunWeight>> weights;
  while (w.executeStep())
    weights[w.getColumn(0).getInt64()].push_back({w.getColumn(1).getString(), w.getColumn(2).getInt64()});
  for (auto& r : out)
    if (auto it = weights.find(r.id); it != weights.end()) r.weights = std::move(it->second);
  return out;
}

std::optional<RunRecord> latest_run(SQLite::Database& db, const std::string& instrument_id) {
  SQLite::Statement q(db, std::string(run_select) +
                              " WHERE instrument_id = ? AND id NOT IN (SELECT supersedes FROM check_runs WHERE "
                              "supersedes IS NOT NULL) AND id NOT IN (SELECT run_id FROM run_voids) "
                              "ORDER BY performed_on DESC, id DESC LIMIT 1");
  q.bind(1, instrument_id);
  if (!q.executeStep()) return std::nullopt;
  return run_from(q);
}

std::int64_t add_certificate(Recorder& rec, const CertificateRecord& c) {
  return rec.insert("certificates",
                    {{"number", c.number},
                     {"run_id", c.run_id},
                     {"kind", c.kind},
                     {"issued_at", c.issued_at},
                     {"issued_by", c.issued_by},
                     {"content_json", c.content.dump()},
                     {"content_sha256", c.content_sha256},
                     {"supersedes", c.supersedes ? Value(*c.supersedes) : Value()}},
                    {"id"});
}

namespace {
constexpr const char* certificate_select =
    "SELECT id, number, run_id, kind, issued_at, issued_by, content_json, content_sha256, supersedes FROM "
    "certificates";

CertificateRecord certificate_from(SQLite::Statement& q) {
  CertificateRecord c;
  c.id = q.getColumn(0).getInt64();
  c.number = q.getColumn(1).getString();
  c.run_id = q.getColumn(2).getInt64();
  c.kind = q.getColumn(3).getString();
  c.issued_at = q.getColumn(4).getString();
  c.issued_by = q.getColumn(5).getString();
  c.content = json::parse(q.getColumn(6).getString());
  c.content_sha256 = q.getColumn(7).getString();
  if (!q.getColumn(8).isNull()) c.supersedes = q.getColumn(8).getInt64();
  return c;
}
}  // namespace

std::optional<CertificateRecord> find_certificate(SQLite::Database& db, const std::string& number) {
  SQLite::Statement q(db, std::string(certificate_select) + " WHERE number = ?");
  q.bind(1, number);
  if (!q.executeStep()) return std::nullopt;
  return certificate_from(q);
}

std::optional<CertificateRecord> find_certificate_by_id(SQLite::Database& db, std::int64_t id) {
  SQLite::Statement q(db, std::string(certificate_select) + " WHERE id = ?");
  q.bind(1, id);
  if (!q.executeStep()) return std::nullopt;
  return certificate_from(q);
}

std::optional<CertificateRecord> certificate_for_run(SQLite::Database& db, std::int64_t run_id) {
  SQLite::Statement q(db, std::string(certificate_select) + " WHERE run_id = ? ORDER BY id DESC LIMIT 1");
  q.bind(1, run_id);
  if (!q.executeStep()) return std::nullopt;
  return certificate_from(q);
}

std::string next_certificate_number(SQLite::Database& db, const std::string& prefix, int year) {
  const std::string stem = fmt::format("{}-{}-", prefix, year);
  SQLite::Statement q(db, "SELECT count(*) FROM certificates WHERE number LIKE ? || '%'");
  q.bind(1, stem);
  q.executeStep();
  return fmt::format("{}{:04}", stem, q.getColumn(0).getInt() + 1);
}

}  // namespace plumb::store
