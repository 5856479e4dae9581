#include "app/demo/demo_lab.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include <cctype>
#include <cmath>
#include <map>
#include <nlohmann/json.hpp>
#include <random>

#include "app/calibration/record.hpp"
#include "app/calibration/settings.hpp"
#include "app/certificates/issue.hpp"
#include "app/people/accounts.hpp"
#include "app/pipette/record.hpp"
#include "app/pipette/registry.hpp"
#include "app/records/lab_key.hpp"
#include "app/registry/balances.hpp"
#include "app/registry/lab.hpp"
#include "app/registry/weights.hpp"
#include "app/weekly_check/record.hpp"
#include "checks/pipette.hpp"
#include "core/condition_units.hpp"
#include "core/errors.hpp"
#include "metrology/gravimetric.hpp"
#include "store/embedded.hpp"
#include "store/repository.hpp"
#include "store/users.hpp"

namespace plumb::app {
namespace {

using nlohmann::json;

// Box-Muller on mt19937_64's raw output: unlike std::normal_distribution, the same on every platform.
class Gauss {
 public:
  explicit Gauss(std::uint64_t seed) : engine_(seed) {}
  double next() {
    const double u1 = (static_cast<double>(engine_() >> 11) + 1.0) * 0x1.0p-53;
    const double u2 = static_cast<double>(engine_() >> 11) * 0x1.0p-53;
    return std::sqrt(-2.0 * std::log(u1)) * std::cos(2.0 * M_PI * u2);
  }
  std::uint64_t raw() { return engine_(); }

 private:
  std::mt19937_64 engine_;
};

void make_room(const std::filesystem::path& path, const std::string& demo_lab) {
  if (!std::filesystem::exists(path)) return;
  {
    store::Database existing(path, store::Database::Open::existing);
    const auto lab = store::find_lab(existing.sql());
    if (!lab || lab->name != demo_lab)
      throw InputError(
          fmt::format("--db \"{}\" exists and is not a plumb demo database; choose another file.", path.string()));
  }
  for (const char* suffix : {"", "-wal", "-shm"}) std::filesystem::remove(path.string() + suffix);
}

/// One calibration of the scenario: its balance's settings, then the run, through the validated paths.
std::int64_t record_demo_calibration(store::Database& db, const store::Actor& quality,
                                     const store::Actor& operator_actor, const json& c) {
  const json& s = c["settings"];
  CalibrationSettingsInput settings;
  settings.instrument_id = c["balance"];
  settings.accuracy_class = s["class"].get<std::string>();
  settings.e = s["e"].get<std::string>();
  settings.tolerance = s["tolerance"];
  settings.decision_rule = s["decision_rule"];
  settings.calibrate_every = s["calibrate_every"];
  settings.since = s["since"].get<std::string>();
  set_calibration_settings(db, quality, settings);
  CalibrationRunInput in;
  in.instrument_id = c["balance"];
  in.readings_csv = c["header"].get<std::string>() + "\n";
  for (const auto& row : c["rows"]) in.readings_csv += row.get<std::string>() + "\n";
  in.readings_source = fmt::format("demo calibration of {}", in.instrument_id);
  in.on = c["on"];
  in.operator_name = operator_actor.name;
  in.temperature_c = c["temperature"].get<std::string>();
  in.pressure_hpa = c["pressure"].get<std::string>();
  in.humidity_pct = c["humidity"].get<std::string>();
  // The demo lab's thermometer, barometer and hygrometer uncertainties, for the air density's u.
  for (const auto& [key, field] : {std::pair{"temperature_u", &in.temperature_u},
                                   std::pair{"pressure_u", &in.pressure_u}, std::pair{"humidity_u", &in.humidity_u}})
    if (c.contains(key)) *field = c[key].get<std::string>();
  in.model = c["model"];
  return record_calibration(db, operator_actor, in).id;
}

/// The weighings CSV of one invented pipette check: for each ISO 8655-6 test volume and channel, ten
/// volumes with the pipette's bias and CV (and a fault on one channel when the scenario says so), turned into
/// masses with Z and rounded to the balance's scale interval as its display would show them (in g).
std::string pipette_weighings(const json& p, const store::PipetteRecord& rec, int check, double z_ul_per_mg,
                              const ExactMass& readability, Gauss& noise) {
  const double d_mg = readability.approx().mg();
  const int decimals = readability.in_grams().significant_scale();
  std::string csv = "volume,channel,reading\n";
  for (const ExactVolume& v : checks::default_test_volumes(rec.definition)) {
    for (int ch = 1; ch <= rec.definition.channels; ++ch) {
      double bias_pct = p["bias_pct"].get<double>();
      if (p.contains("fault") && p["fault"]["check"].get<int>() == check && p["fault"]["channel"].get<int>() == ch)
        bias_pct = p["fault"]["bias_pct"].get<double>();
      const double selected = v.approx().ul();
      for (int i = 0; i < 10; ++i) {
        const double volume =
            selected * (1.0 + bias_pct / 100.0) + selected * p["cv_pct"].get<double>() / 100.0 * noise.next();
        const double mg = std::round(volume / z_ul_per_mg / d_mg) * d_mg;
        csv += fmt::format("{},{},{:.{}f}\n", v.ul_text(), ch, mg / 1e3, decimals);
      }
    }
  }
  return csv;
}

/// The demo's accounts: an administrator, the quality manager, a reviewer and the technicians of the scenario,
/// each with a demo-only password (kept as given: no change is forced at the first log-in of a demo account).
std::map<std::string, store::Actor> add_demo_users(store::Database& db, const json& scenario,
                                                   std::vector<DemoUser>& users) {
  users.push_back({"demo-admin", "Noor Castellanos", "administrator", "demo-only-admin-pass"});
  users.push_back({"ines", "Dr. Ines Varga", "quality manager", "demo-only-ines-pass"});
  users.push_back({"mira", "Mira Solberg", "reviewer", "demo-only-mira-pass"});
  for (const auto& person : scenario["people"]) {
    const auto name = person.get<std::string>();
    std::string login;
    for (char c : name.substr(0, name.find(' ')))
      login += static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
    users.push_back({login, name, "technician", "demo-only-" + login + "-pass"});
  }
  std::map<std::string, store::Actor> actors;
  const store::Actor admin = add_first_administrator(db, {users[0].login, users[0].name, {}, users[0].password});
  actors[users[0].name] = admin;
  for (std::size_t i = 1; i < users.size(); ++i) {
    const auto& u = users[i];
    const auto user = add_user(db, admin, {u.login, u.name, {u.role}, u.password});
    const store::Actor actor{u.name, store::current_os_user(), user.id};
    SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
    store::Recorder rec(db.sql(), actor);
    store::add_password(rec, user.id, store::current_password(db.sql(), user.id)->hash, false);
    rec.commit(tx);
    actors[u.name] = actor;
  }
  return actors;
}

}  // namespace

DemoSummary build_demo(const std::filesystem::path& path, const std::function<void(int, int)>& progress) {
  const json scenario = json::parse(embedded::demo_scenario());
  DemoSummary summary;
  summary.db_path = path;
  summary.lab = scenario["lab"].get<std::string>();
  summary.report_on = parse_date(scenario["report_on"].get<std::string>());
  make_room(path, summary.lab);

  store::Database db(path, store::Database::Open::create);
  // The accounts' records are the first ones signed: the lab's key is there before them (init_lab then uses it).
  ensure_lab_key(db.path());
  const auto people = scenario["people"].get<std::vector<std::string>>();
  const auto actors = add_demo_users(db, scenario, summary.users);
  const store::Actor quality = actors.at("Dr. Ines Varga");
  init_lab(db, quality, summary.lab);
  for (const auto& w : scenario["weights"]) {
    WeightInput in;
    in.id = w["id"];
    in.nominal = w["nominal"];
    in.weight_class = w["class"];
    in.correction = w["correction"];
    in.uncertainty = w["uncertainty"];
    in.k = w["k"];
    in.certificate = w["certificate"];
    in.calibrated = w["calibrated"];
    in.due = w["due"];
    // What the demo lab states beyond the certificate, for the buoyancy and drift terms of its calibrations.
    const auto stated = [&](const char* key) {
      return w.contains(key) ? std::optional<std::string>(w[key].get<std::string>()) : std::nullopt;
    };
    in.density = stated("density");
    in.density_u = stated("density_u");
    in.drift = stated("drift");
    add_weight(db, quality, in);
  }
  const Date first = parse_date(scenario["first_check"].get<std::string>());
  for (const auto& b : scenario["balances"]) {
    BalanceInput in;
    in.id = b["id"];
    in.capacity = b["capacity"];
    in.readability = b["readability"];
    in.every = b["every"];
    in.location = b["location"];
    in.smallest_net = b["smallest_net"].get<std::string>();
    in.since = to_string(first);
    add_balance(db, quality, in);
  }

  for (const auto& p : scenario["pipettes"]) {
    PipetteInput in;
    in.id = p["id"];
    in.nominal = p["nominal"];
    in.range = p["range"];
    in.channels = p["channels"];
    in.every = p["every"];
    in.location = p["location"];
    in.since = to_string(first);
    add_pipette(db, quality, in);
  }
  const json& pc = scenario["pipette_checks"];
  const auto pipette_weeks = pc["weeks"].get<std::vector<int>>();
  Gauss pipette_noise(pc["seed"].get<std::uint64_t>());

  Gauss noise(scenario["seed"].get<std::uint64_t>());
  const int weeks = scenario["weeks"].get<int>();
  const int total = weeks * static_cast<int>(scenario["balances"].size()) +
                    static_cast<int>(pipette_weeks.size() * scenario["pipettes"].size());
  for (int week = 0; week < weeks; ++week) {
    const Date on = add_days(first, 7 * week);
    for (const auto& b : scenario["balances"]) {
      const auto balance = *store::find_balance(db.sql(), b["id"].get<std::string>());
      const auto weight = *store::find_weight(db.sql(), b["weight"].get<std::string>());
      const double d_g = balance.readability.approx().g();
      const int decimals = balance.readability.in_grams().significant_scale();
      const double bias_mg = b["bias_mg"].get<double>() + b["drift_mg_per_year"].get<double>() * week / 52.0;
      const bool late = b.contains("late_from_week") && week >= b["late_from_week"].get<int>();
      const double sd_mg = late ? b["late_sd_mg"].get<double>() : b["sd_mg"].get<double>();
      std::string csv = "reading\n";
      for (int i = 0; i < 10; ++i) {
        const double value = weight.conventional_mass().approx().g() + (bias_mg + sd_mg * noise.next()) * 1e-3;
        // Round to the displayed scale interval, as the balance's display does.
        csv += fmt::format("{:.{}f}\n", std::round(value / d_g) * d_g, decimals);
      }
      CheckInput in;
      in.instrument_id = balance.id;
      in.weight_ids = {weight.id};
      in.readings_csv = csv;
      in.readings_source = fmt::format("demo {} week {}", balance.id, week + 1);
      in.on = to_string(on);
      in.operator_name = people[noise.raw() % people.size()];
      const auto run = record_check(db, actors.at(in.operator_name), in);
      ++summary.runs;
      if (run.verdict == Verdict::fail) ++summary.failed_runs;
      if (balance.id == "AB-01") summary.showcase_run = run.id;
      progress(summary.runs, total);
    }
    // Pipette checks on the balance checked this week, the day after its check.
    const auto check = std::find(pipette_weeks.begin(), pipette_weeks.end(), week);
    if (check == pipette_weeks.end()) continue;
    const auto k = static_cast<std::size_t>(check - pipette_weeks.begin());
    const auto balance = *store::find_balance(db.sql(), pc["balance"].get<std::string>());
    for (const auto& p : scenario["pipettes"]) {
      const auto pipette = *store::find_pipette(db.sql(), p["id"].get<std::string>());
      PipetteCheckInput in;
      in.pipette_id = pipette.id();
      in.balance_id = balance.id;
      in.water_temperature = pc["water_temp"][k];
      in.pressure = pc["pressure"][k];
      in.humidity = pc["humidity"][k];
      const double z = gravimetric::z_factor({parse_celsius(in.water_temperature, "water_temp").to_double(),
                                              parse_hectopascals(in.pressure, "pressure").to_double(),
                                              parse_percent_rh(in.humidity, "humidity").to_double()})
                           .z_ul_per_mg;
      in.readings_csv = pipette_weighings(p, pipette, static_cast<int>(k), z, balance.readability, pipette_noise);
      in.readings_source = fmt::format("demo {} check {}", pipette.id(), k + 1);
      in.on = to_string(add_days(on, pc["day_after_balance_check"].get<int>()));
      in.operator_name = people[pipette_noise.raw() % people.size()];
      const auto run = record_pipette_check(db, actors.at(in.operator_name), in);
      ++summary.runs;
      if (run.verdict == Verdict::fail) ++summary.failed_runs;
      progress(summary.runs, total);
    }
  }
  for (const auto& c : scenario.value("calibrations", json::array())) {
    record_demo_calibration(db, quality, actors.at(c["by"].get<std::string>()), c);
    ++summary.runs;
  }
  return summary;
}

}  // namespace plumb::app
