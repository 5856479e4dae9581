#include "app/pipette/record.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include <algorithm>
#include <charconv>
#include <map>

#include "app/pipette/balance_calibration.hpp"
#include "app/pipette/edition.hpp"
#include "app/pipette/registry.hpp"
#include "app/registry/fields.hpp"
#include "app/registry/lab.hpp"
#include "app/registry/service_status.hpp"
#include "checks/pipette.hpp"
#include "checks/repeatability.hpp"
#include "core/condition_units.hpp"
#include "core/csv_columns.hpp"
#include "core/errors.hpp"
#include "core/readings_csv.hpp"
#include "metrology/gravimetric.hpp"
#include "report/pipette/json.hpp"
#include "store/pipettes.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

using nlohmann::json;

std::string ul(ExactVolume v) {
  return v.to_string();
}

std::string_view trim(std::string_view s) {
  while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
  while (!s.empty() && (s.back() == ' ' || s.back() == '\t' || s.back() == '\r')) s.remove_suffix(1);
  return s;
}

std::vector<PipetteWeighing> parse_weighings_csv(std::string_view text, const std::string& source,
                                                 MassUnit default_unit) {
  std::vector<PipetteWeighing> out;
  int volume_col = -1, channel_col = -1, reading_col = -1, unit_col = -1;
  std::size_t columns = 0;
  bool header = false;
  std::vector<std::string> header_names;
  std::size_t pos = text.substr(0, 3) == "\xEF\xBB\xBF" ? 3 : 0;
  int line_no = 0;
  while (pos < text.size()) {
    std::size_t end = text.find('\n', pos);
    if (end == std::string_view::npos) end = text.size();
    const std::string_view raw = text.substr(pos, end - pos);
    pos = end + 1;
    ++line_no;
    if (trim(raw).empty()) continue;
    if (raw.find('\0') != std::string_view::npos)
      throw InputError(fmt::format("{} line {}: contains a NUL byte; this is not a text CSV file.", source, line_no));
    const auto fields = split_csv_line(raw);
    if (!header) {
      constexpr std::string_view known[] = {"volume", "channel", "reading", "unit"};
      check_csv_header(fields, known, source, line_no, "volume,reading[,channel][,unit]");
      for (std::size_t i = 0; i < fields.size(); ++i) {
        const std::string name = csv_column_key(fields[i]);
        const int col = static_cast<int>(i);
        if (name == "volume") volume_col = col;
        if (name == "channel") channel_col = col;
        if (name == "reading") reading_col = col;
        if (name == "unit") unit_col = col;
      }
      if (volume_col < 0 || reading_col < 0)
        throw InputError(
            fmt::format("{} line {}: the header needs a \"volume\" and a \"reading\" column (and "
                        "optionally \"channel\" and \"unit\").",
                        source, line_no));
      columns = fields.size();
      header = true;
      header_names = fields;
      continue;
    }
    if (fields.size() != columns)
      throw InputError(
          fmt::format("{} line {}: {} field(s) where the header has {}.", source, line_no, fields.size(), columns));
    check_csv_text(raw, fields, header_names, source, line_no);
    PipetteWeighing w;
    w.line = line_no;
    const auto field = [&](int col) { return fields[static_cast<std::size_t>(col)]; };
    w.volume = parse_volume(field(volume_col), fmt::format("{} line {} column volume: value", source, line_no),
                            VolumeUnit::ul);
    if (channel_col >= 0 && !field(channel_col).empty()) {
      const std::string c = field(channel_col);
      const auto [p, ec] = std::from_chars(c.data(), c.data() + c.size(), w.channel);
      if (ec != std::errc() || p != c.data() + c.size() || w.channel < 1)
        throw InputError(fmt::format("{} line {} column channel: value \"{}\" is not a channel number (1, 2, ...).",
                                     source, line_no, c));
    }
    w.reading.text = field(reading_col);
    w.reading.value = Decimal::parse(w.reading.text, fmt::format("{} line {} column reading: value", source, line_no));
    w.reading.unit = default_unit;
    if (unit_col >= 0 && !field(unit_col).empty())
      w.reading.unit = parse_mass_unit(field(unit_col), fmt::format("{} line {} column unit: value", source, line_no));
    out.push_back(std::move(w));
  }
  if (!header)
    throw InputError(fmt::format("{}: is empty; expected a header row with \"volume\" and \"reading\".", source));
  if (out.empty()) throw InputError(fmt::format("{}: has a header but no weighings.", source));
  return out;
}

/// A run condition with its unit (core/condition_units.hpp), inside [lo, hi].
Decimal parse_condition(const std::string& text, std::string_view field,
                        Decimal (*parse)(std::string_view, std::string_view), double lo, double hi,
                        std::string_view unit, std::string_view why) {
  const Decimal v = parse(text, field);
  const double x = v.to_double();
  if (x < lo || x > hi)
    throw InputError(
        fmt::format("{} {} {} is outside {} ({} {} to {} {}).", field, v.to_string(), unit, why, lo, unit, hi, unit));
  return v;
}

/// The repeatability s a run's results give, when they measured one from at least the readings they were
/// judged by (checks::met_its_minimum).
std::optional<Mass> repeatability_evidence(const json& results) {
  if (!results.contains("sd_g") || !results["sd_g"].is_number()) return std::nullopt;
  if (!results.contains("n") || !results["n"].is_number_integer()) return std::nullopt;
  std::optional<long long> required;
  if (results.contains("required_readings") && results["required_readings"].is_number_integer())
    required = results["required_readings"].get<long long>();
  if (!checks::met_its_minimum(results["n"].get<long long>(), required)) return std::nullopt;
  return Mass::grams(results["sd_g"].get<double>());
}

/// The balance as it stood on the run date: usable, in date, and with its latest repeatability.
struct BalanceOnDate {
  store::BalanceRecord balance;
  store::RunRecord latest;  ///< latest check on or before the run date
  std::optional<Mass> repeatability;
  std::optional<std::int64_t> repeatability_run;
};

BalanceOnDate balance_on(store::Database& db, const std::string& id, Date on) {
  const auto b = store::find_balance(db.sql(), id);
  if (!b) throw InputError(fmt::format("--balance \"{}\" is not a registered balance.", id));
  const auto latest = store::latest_run_on_or_before(db.sql(), id, on);
  if (!latest)
    throw InputError(
        fmt::format("--balance {} has no check recorded on or before {}; a pipette check needs a "
                    "balance that is in service and in date.",
                    id, to_string(on)));
  if (latest->verdict == Verdict::fail)
    throw InputError(fmt::format("--balance {} is out of service on {}: its check run {} on {} failed.", id,
                                 to_string(on), latest->id, to_string(latest->performed_on)));
  if (!latest->next_due || *latest->next_due < on)
    throw InputError(
        fmt::format("--balance {} is out of date on {}: its check was due on {} (last check run {} on "
                    "{}).",
                    id, to_string(on), latest->next_due ? to_string(*latest->next_due) : "-", latest->id,
                    to_string(latest->performed_on)));
  BalanceOnDate out{*b, *latest, std::nullopt, std::nullopt};
  // The repeatability of ISO 8655-6 Table 1: the SD of the latest check that measured one, counts (neither
  // corrected nor void) and met its own minimum of readings. A short run says too little about s.
  auto runs = store::runs_of(db.sql(), id);
  for (auto it = runs.rbegin(); it != runs.rend(); ++it) {
    if (it->performed_on > on || !it->current()) continue;
    if (auto s = repeatability_evidence(it->results)) {
      out.repeatability = s;
      out.repeatability_run = it->id;
      break;
    }
  }
  return out;
}

/// The options of a run other than the water temperature and the weighings, validated.
struct RunOptions {
  Date on;
  Decimal pressure, humidity;
  std::optional<ExactMass> evaporation;
  checks::PipetteUncertaintyOptions u_options;
};

RunOptions run_options(const PipetteCheckInput& in) {
  RunOptions o;
  o.on = parse_date(in.on, "--on");
  if (days_between(today_utc(), o.on) > 1) throw InputError(fmt::format("--on {} is in the future.", in.on));
  if (in.operator_name.empty()) throw InputError("operator: the check needs the name of who performed it.");
  validate_free_text(in.operator_name, "operator");
  o.pressure = parse_condition(in.pressure, "--pressure", parse_hectopascals, gravimetric::min_pressure_hpa,
                               gravimetric::max_pressure_hpa, "hPa", "a plausible laboratory air pressure");
  o.humidity = parse_condition(in.humidity, "--humidity", parse_percent_rh, 0, 100, "%RH", "a relative humidity");
  if (in.evaporation) {
    const std::string& e = *in.evaporation;
    if (e.empty() || !std::isalpha(static_cast<unsigned char>(e.back())))
      throw InputError(fmt::format("--evaporation \"{}\" needs a unit of mass, e.g. 0.01mg.", e));
    o.evaporation = ExactMass::parse(e, "--evaporation");
    if (*o.evaporation < ExactMass{})
      throw InputError(fmt::format("--evaporation \"{}\" is negative; give the mass lost per weighing.", e));
  }
  // Upper bounds far above any laboratory instrument: beyond them the value is a typing slip.
  const auto u_option = [](const std::optional<std::string>& text, std::string_view field,
                           Decimal (*parse)(std::string_view, std::string_view), double hi, std::string_view unit,
                           std::string_view what) -> std::optional<double> {
    if (!text) return std::nullopt;
    return parse_condition(*text, field, parse, 0, hi, unit, what).to_double();
  };
  o.u_options.water_temperature_u_c = u_option(in.water_temperature_u, "--water-temp-u", parse_celsius, 2.0, "degC",
                                               "the plausible range of a thermometer's standard uncertainty");
  o.u_options.air_density_u_kg_m3 = u_option(in.air_density_u, "--air-density-u", parse_kg_per_cubic_metre, 0.1,
                                             "kg/m3", "the plausible range of an air density's standard uncertainty");
  return o;
}

/// The pipette and the balance, as the run needs them on its date.
struct RunInstruments {
  store::PipetteRecord pipette;
  BalanceOnDate bal;
};

RunInstruments run_instruments(store::Database& db, const PipetteCheckInput& in, Date on) {
  require_lab(db);
  const auto pipette = store::find_pipette(db.sql(), in.pipette_id);
  if (!pipette) throw InputError(fmt::format("pipette \"{}\" is not registered.", in.pipette_id));
  if (!in.supersedes) require_in_service(db, "instrument", pipette->id());  // a correction is not a new check
  require_in_service(db, "instrument", in.balance_id);
  return {*pipette, balance_on(db, in.balance_id, on)};
}

}  // namespace

Decimal parse_water_temperature(const std::string& text, std::string_view field) {
  return parse_condition(text, field, parse_celsius, gravimetric::min_water_temperature_c,
                         gravimetric::max_water_temperature_c, "degC",
                         "the range of the gravimetric method (ISO 8655-6)");
}

void check_pipette_weighing(const MassReading& reading, const std::string& where, const store::BalanceRecord& balance) {
  if (reading.decimals_in_grams() > balance.readability.in_grams().significant_scale())
    throw InputError(
        fmt::format("{}: weighing \"{}\" {} shows more decimals than the readability {} of balance {} "
                    "allows.",
                    where, reading.text, to_string(reading.unit), balance.readability.to_string(), balance.id));
  if (reading.mass() <= ExactMass{})
    throw InputError(
        fmt::format("{}: weighing \"{}\" {} is not a positive mass.", where, reading.text, to_string(reading.unit)));
  if (reading.mass() > balance.capacity)
    throw InputError(fmt::format("{}: weighing \"{}\" {} exceeds the capacity {} of balance {}.", where, reading.text,
                                 to_string(reading.unit), balance.capacity.to_string(), balance.id));
}

void check_pipette_setup(store::Database& db, const PipetteCheckInput& in) {
  const RunOptions o = run_options(in);
  run_instruments(db, in, o.on);
}

store::RunRecord record_pipette_check(store::Database& db, const store::Actor& actor, const PipetteCheckInput& in) {
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::Recorder rec(db.sql(), actor);
  const std::int64_t id = record_pipette_check_in(db, rec, in);
  rec.commit(tx);
  return *store::find_run(db.sql(), id);
}

std::int64_t record_pipette_check_in(store::Database& db, store::Recorder& rec, const PipetteCheckInput& in,
                                     const store::RunDetails& extra) {
  PipetteRunDraft draft = build_pipette_run(db, in);
  return store::add_run(rec, draft.run, [&](store::RowGroup& group, std::int64_t run_id) {
    draft.conditions.run_id = run_id;
    store::add_pipette_run_conditions(group, draft.conditions);
    if (extra) extra(group, run_id);
  });
}

PipetteRunDraft build_pipette_run(store::Database& db, const PipetteCheckInput& in) {
  // Conditions, named by the options they came from.
  const Decimal water = parse_water_temperature(in.water_temperature, "--water-temp");
  const RunOptions o = run_options(in);
  const Date on = o.on;
  const Decimal& pressure = o.pressure;
  const Decimal& humidity = o.humidity;
  const std::optional<ExactMass>& evaporation = o.evaporation;
  const checks::PipetteUncertaintyOptions& u_options = o.u_options;
  std::vector<PipetteWeighing> parsed;
  if (!in.parsed_weighings) parsed = parse_weighings_csv(in.readings_csv, in.readings_source, in.default_unit);
  const std::vector<PipetteWeighing>& lines = in.parsed_weighings ? *in.parsed_weighings : parsed;

  const RunInstruments instruments = run_instruments(db, in, on);
  const store::PipetteRecord* pipette = &instruments.pipette;
  const checks::PipetteDefinition& def = pipette->definition;
  const BalanceOnDate& bal = instruments.bal;

  // Every line checked with its line number before anything is computed.
  const ExactVolume lower = def.kind == checks::PipetteKind::variable ? *def.lower_limit : def.nominal;
  for (const PipetteWeighing& w : lines) {
    const std::string where = fmt::format("{} line {}", in.readings_source, w.line);
    if (w.volume < lower || w.volume > def.nominal)
      throw InputError(
          fmt::format("{} column volume: {} is outside the range of pipette {} ({}).", where, ul(w.volume), def.id,
                      def.kind == checks::PipetteKind::fixed ? fmt::format("fixed at {}", ul(def.nominal))
                                                             : fmt::format("{} to {}", ul(lower), ul(def.nominal))));
    if (w.channel > def.channels)
      throw InputError(
          fmt::format("{} column channel: channel {} does not exist on pipette {}, which has {} "
                      "channel(s).",
                      where, w.channel, def.id, def.channels));
    check_pipette_weighing(w.reading, where, bal.balance);
  }

  // Group by test volume and channel, in the order they first appear.
  checks::PipetteRunInput input;
  input.pipette = def;
  input.balance.id = bal.balance.id;
  input.balance.readability = bal.balance.readability;
  input.balance.repeatability = bal.repeatability;
  input.balance.in_service = true;
  input.balance.due = bal.latest.next_due;
  input.run_date = on;
  input.environment = {water.to_double(), pressure.to_double(), humidity.to_double()};
  input.evaporation_per_weighing = evaporation;
  input.uncertainty = u_options;
  const BalanceCalibrationLookup calibration = balance_calibration_on(db, bal.balance.id, on);
  input.balance_calibration = calibration.calibration;
  input.no_balance_calibration = calibration.absent_reason;
  for (const PipetteWeighing& w : lines) {
    auto tv =
        std::find_if(input.volumes.begin(), input.volumes.end(), [&](const auto& v) { return v.volume == w.volume; });
    if (tv == input.volumes.end()) tv = input.volumes.insert(input.volumes.end(), {w.volume, {}});
    auto ch =
        std::find_if(tv->channels.begin(), tv->channels.end(), [&](const auto& c) { return c.channel == w.channel; });
    if (ch == tv->channels.end()) ch = tv->channels.insert(tv->channels.end(), {w.channel, {}});
    ch->weighings.push_back(w.reading);
  }
  for (const auto& tv : input.volumes)
    for (const auto& ch : tv.channels)
      if (ch.weighings.size() < checks::min_replicates)
        throw InputError(
            fmt::format("{}: test volume {}, channel {} has {} weighing(s); the gravimetric check needs "
                        "at least {} replicates ({} recommended).",
                        in.readings_source, ul(tv.volume), ch.channel, ch.weighings.size(), checks::min_replicates,
                        checks::recommended_replicates));
  // The edition the pipette is checked to: a run that misses one of its requirements is refused.
  const checks::Iso8655Edition edition = pipette_edition(db, def.id);
  std::vector<checks::EditionVolume> edition_volumes;
  edition_volumes.reserve(input.volumes.size());
  for (const auto& tv : input.volumes) {
    checks::EditionVolume ev{tv.volume, {}};
    ev.replicates.reserve(tv.channels.size());
    for (const auto& ch : tv.channels) ev.replicates.emplace_back(ch.channel, ch.weighings.size());
    edition_volumes.push_back(std::move(ev));
  }
  if (const auto shortfalls = checks::edition_shortfalls(edition, def, edition_volumes); !shortfalls.empty())
    throw InputError(fmt::format("{}: {} (pipette {} is checked to ISO 8655:{}; {} requirement(s) not met).",
                                 in.readings_source, shortfalls.front(), def.id, checks::key(edition),
                                 shortfalls.size()));
  const checks::PipetteRunResult result = checks::evaluate_pipette_run(input);

  store::RunRecord run;
  run.instrument_id = def.id;
  run.procedure = checks::Procedure::gravimetric;
  run.performed_on = on;
  run.operator_name = in.operator_name;
  run.supersedes = in.supersedes;
  run.reason = in.reason;
  run.results = report::to_json(result);
  run.results["policy"] = def.limits.key();
  run.results["edition"] = {{"edition", std::string(checks::key(edition))},
                            {"statement", checks::edition_statement(edition, def)}};
  run.results["policy_name"] = def.limits.name();
  run.results["pipette"] = {{"id", def.id},
                            {"kind", std::string(checks::to_string(def.kind))},
                            {"nominal_ul", def.nominal.approx().ul()},
                            {"lower_limit_ul", def.lower_limit ? json(def.lower_limit->approx().ul()) : json()},
                            {"channels", def.channels},
                            {"limits", limits_summary(def.limits)},
                            {"check_every", pipette->every.to_string()}};
  run.results["balance"] = {
      {"id", bal.balance.id},
      {"readability_g", bal.balance.readability.approx().g()},
      {"repeatability_g", bal.repeatability ? json(bal.repeatability->g()) : json()},
      {"repeatability_run", bal.repeatability_run ? json(*bal.repeatability_run) : json()},
      {"latest_check_run", bal.latest.id},
      {"latest_check_on", to_string(bal.latest.performed_on)},
      {"due_on", bal.latest.next_due ? json(to_string(*bal.latest.next_due)) : json()},
      // The calibration whose U(E) stands for the balance in the budget, or why none does.
      {"calibration_run", calibration.calibration ? json(calibration.calibration->run_id) : json()},
      {"calibration_certificate", calibration.calibration && !calibration.calibration->certificate.empty()
                                      ? json(calibration.calibration->certificate)
                                      : json()},
      {"calibration_absent", calibration.calibration ? json() : json(calibration.absent_reason)}};
  run.results["environment"] = {
      {"water_temperature_c", water.to_double()},
      {"air_pressure_hpa", pressure.to_double()},
      {"humidity_pct", humidity.to_double()},
      {"evaporation_g", evaporation ? json(evaporation->approx().g()) : json()},
      // Entered for the budget (null: the stated default applied); a correction reuses them.
      {"water_temperature_u_c", u_options.water_temperature_u_c ? json(*u_options.water_temperature_u_c) : json()},
      {"air_density_u_kg_m3", u_options.air_density_u_kg_m3 ? json(*u_options.air_density_u_kg_m3) : json()}};
  run.verdict = result.verdict;
  if (result.verdict == Verdict::pass) run.next_due = add_interval(on, pipette->every);
  int seq = 1;
  // Stored in the order of the file, each with the series of its test volume and channel.
  for (const PipetteWeighing& w : lines)
    run.readings.push_back({seq++, store::pipette_series(w.volume, w.channel), w.reading});

  store::PipetteRunConditions c;
  c.balance_id = bal.balance.id;
  c.balance_run_id = bal.latest.id;
  c.water_temperature_c = water;
  c.air_pressure_hpa = pressure;
  c.humidity_pct = humidity;
  c.evaporation = evaporation;
  return {std::move(run), std::move(c)};
}

}  // namespace plumb::app
