#include <fmt/ostream.h>
#include <fmt/ranges.h>

#include <algorithm>
#include <fstream>
#include <iostream>
#include <sstream>

#include "app/calibration/record.hpp"
#include "app/pipette/record.hpp"
#include "app/runs/correct.hpp"
#include "app/runs/resolve.hpp"
#include "app/runs/void_run.hpp"
#include "app/weekly_check/record.hpp"
#include "checks/procedure.hpp"
#include "cli/command_groups.hpp"
#include "core/errors.hpp"
#include "report/calibration/text.hpp"
#include "report/runs/json.hpp"
#include "report/runs/raw_lines.hpp"
#include "report/runs/text.hpp"
#include "store/raw_lines.hpp"
#include "store/repository.hpp"
#include "store/users.hpp"

namespace plumb::cli {
namespace {

std::string read_input(const std::string& path, std::string& source) {
  std::stringstream text;
  if (path == "-") {
    source = "standard input";
    text << std::cin.rdbuf();
    return text.str();
  }
  source = path;
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(fmt::format("--readings file \"{}\" cannot be read.", path));
  text << in.rdbuf();
  return text.str();
}

void print_run(const store::RunRecord& run, const std::string& format, Env& env) {
  const auto j = report::run_json(run);
  if (format == "json")
    env.out << j.dump(2) << "\n";
  else
    env.out << report::run_text(j);
}

/// --on, or today's local date when it is not given (the bench records what was done today).
std::string date_performed(const po::variables_map& vm) {
  return vm.count("on") ? vm["on"].as<std::string>() : to_string(today_local());
}

/// Every recording prints the run (its date marked "(today)" when --on was left out) and, with --gate, exits 1
/// when the check failed.
int print_and_gate(const store::RunRecord& run, const po::variables_map& vm, const std::string& format, Env& env) {
  const auto j = report::run_json(run);
  if (format == "json")
    env.out << j.dump(2) << "\n";
  else
    env.out << (vm.count("on") ? report::run_text(j) : report::run_text_dated_today(j));
  return vm["gate"].as<bool>() && run.verdict == Verdict::fail ? 1 : 0;
}

/// Each procedure takes its own options (the registry lists them); one meant for another procedure is refused
/// rather than ignored.
void refuse_other_procedures_options(const po::variables_map& vm, checks::Procedure procedure) {
  const auto& mine = checks::spec(procedure).options;
  for (const std::string_view option : checks::procedure_options()) {
    const std::string name(option);
    if (!vm.count(name) || vm[name].defaulted()) continue;
    if (std::find(mine.begin(), mine.end(), option) != mine.end()) continue;
    std::vector<std::string_view> takers;
    for (const auto p : checks::all_procedures) {
      const auto& theirs = checks::spec(p).options;
      if (std::find(theirs.begin(), theirs.end(), option) != theirs.end()) takers.push_back(checks::to_string(p));
    }
    throw InputError(fmt::format("--{} does not apply to --procedure {} (it is an option of: {}).", name,
                                 checks::to_string(procedure), fmt::join(takers, ", ")));
  }
}

/// "repeatability or calibration (balances), gravimetric (pipettes)", from the registry.
std::string procedures_by_instrument() {
  std::string out;
  for (const auto kind : {checks::InstrumentKind::balance, checks::InstrumentKind::pipette}) {
    std::vector<std::string_view> keys;
    for (const auto p : checks::all_procedures)
      if (checks::spec(p).instrument == kind) keys.push_back(checks::to_string(p));
    if (keys.empty()) continue;
    out += fmt::format("{}{} ({}s)", out.empty() ? "" : ", ", fmt::join(keys, " or "), checks::to_string(kind));
  }
  return out;
}

int record_weekly_check(const po::variables_map& vm, Env& env, const std::string& format) {
  app::CheckInput in;
  in.instrument_id = vm["instrument"].as<std::string>();
  if (vm.count("weight")) in.weight_ids = vm["weight"].as<std::vector<std::string>>();
  in.default_unit = parse_mass_unit(vm["unit"].as<std::string>(), "--unit");
  in.readings_csv = read_input(vm["readings"].as<std::string>(), in.readings_source);
  in.on = date_performed(vm);
  auto db = env.open();
  const auto actor = env.actor(db);
  in.operator_name = actor.name;  // the authenticated user performed it
  const auto run = app::record_check(db, actor, in);
  return print_and_gate(run, vm, format, env);
}

int record_calibration(const po::variables_map& vm, Env& env, const std::string& format) {
  app::CalibrationRunInput in;
  in.instrument_id = vm["instrument"].as<std::string>();
  in.default_unit = parse_mass_unit(vm["unit"].as<std::string>(), "--unit");
  in.readings_csv = read_input(vm["readings"].as<std::string>(), in.readings_source);
  in.on = date_performed(vm);
  in.temperature_c = optional_string(vm, "temperature");
  in.pressure_hpa = optional_string(vm, "pressure");
  in.humidity_pct = optional_string(vm, "humidity");
  in.temperature_u = optional_string(vm, "temperature-u");
  in.pressure_u = optional_string(vm, "pressure-u");
  in.humidity_u = optional_string(vm, "humidity-u");
  in.air_formula = vm["air-formula"].as<std::string>();
  in.model = vm["model"].as<std::string>();
  auto db = env.open();
  const auto actor = env.actor(db);
  in.operator_name = actor.name;
  const auto run = app::record_calibration(db, actor, in);
  return print_and_gate(run, vm, format, env);
}

std::string required(const po::variables_map& vm, const char* name, const char* what) {
  if (!vm.count(name)) throw InputError(fmt::format("--{} is required for a gravimetric check: {}.", name, what));
  return vm[name].as<std::string>();
}

int record_pipette(const po::variables_map& vm, Env& env, const std::string& format) {
  app::PipetteCheckInput in;
  in.pipette_id = vm["instrument"].as<std::string>();
  in.balance_id = required(vm, "balance", "the balance the water was weighed on");
  in.water_temperature = required(vm, "water-temp", "the water temperature, e.g. 20.5C");
  in.pressure = required(vm, "pressure", "the air pressure, e.g. 1013hPa");
  in.humidity = required(vm, "humidity", "the relative humidity, e.g. 50%");
  in.evaporation = optional_string(vm, "evaporation");
  in.water_temperature_u = optional_string(vm, "water-temp-u");
  in.air_density_u = optional_string(vm, "air-density-u");
  in.default_unit = parse_mass_unit(vm["unit"].as<std::string>(), "--unit");
  in.readings_csv = read_input(vm["readings"].as<std::string>(), in.readings_source);
  in.on = date_performed(vm);
  auto db = env.open();
  const auto actor = env.actor(db);
  in.operator_name = actor.name;
  const auto run = app::record_pipette_check(db, actor, in);
  return print_and_gate(run, vm, format, env);
}

}  // namespace

std::vector<Command> check_commands() {
  Command record{
      "check",
      "record",
      "record a check run from readings, compute and judge it, schedule the next",
      "plumb check record BAL-A --procedure repeatability --weight W100 --readings readings.csv --on 2026-11-30\n"
      "  plumb check record BAL-A --procedure calibration --readings cal.csv "
      "--temperature 20.3C --pressure 1009hPa --humidity 45% --model line --on 2026-11-30\n"
      "  plumb check record P-07 --procedure gravimetric --balance SM-02 --water-temp 20.5C "
      "--pressure 1013hPa --humidity 50% --readings weighings.csv --on 2026-11-30",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("instrument", po::value<std::string>()->required(), "instrument id (positional)")(
            "procedure", po::value<std::string>()->default_value("repeatability"),
            ("check procedure: " + procedures_by_instrument()).c_str())("weight", po::value<std::vector<std::string>>(),
                                                                        "reference weight id (repeatability)")(
            "readings", po::value<std::string>()->required(),
            "CSV with a header and a `reading` column (optional `unit`); calibration: columns stage,part,load,"
            "position,direction,reading,unit; gravimetric: also `volume` and optional `channel`; - for standard input")(
            "temperature", po::value<std::string>(), "calibration: air temperature with its unit, e.g. 20.3C")(
            "pressure", po::value<std::string>(),
            "calibration and gravimetric: air pressure with its unit, e.g. 1009hPa")(
            "humidity", po::value<std::string>(),
            "calibration and gravimetric: relative humidity with its unit, e.g. 45%")(
            "air-formula", po::value<std::string>()->default_value("cipm2007"), "calibration: cipm2007 | oiml-r111")(
            "temperature-u", po::value<std::string>(),
            "calibration: standard uncertainty of the air thermometer, e.g. 0.1C (propagated into the air density)")(
            "pressure-u", po::value<std::string>(), "calibration: standard uncertainty of the barometer, e.g. 0.5hPa")(
            "humidity-u", po::value<std::string>(), "calibration: standard uncertainty of the hygrometer, e.g. 2%")(
            "model", po::value<std::string>()->default_value("line"),
            "calibration: fitted model, line | through-origin | quadratic")(
            "balance", po::value<std::string>(), "gravimetric: the balance the water was weighed on")(
            "water-temp", po::value<std::string>(), "gravimetric: water temperature with its unit, 15C to 30C")(
            "evaporation", po::value<std::string>(),
            "gravimetric: mass lost by evaporation per weighing, with unit (e.g. 0.01mg); added to each weighing")(
            "water-temp-u", po::value<std::string>(),
            "gravimetric: standard uncertainty of the water thermometer, e.g. 0.05C (default 0.2C / sqrt 3, the "
            "maximum error ISO 8655-6:2002 allows)")(
            "air-density-u", po::value<std::string>(),
            "gravimetric: standard uncertainty of the air density, e.g. 0.005kg/m3 (default 0.01kg/m3)")(
            "unit", po::value<std::string>()->default_value("g"), "unit of readings without a unit column")(
            "on", po::value<std::string>(), "date performed, YYYY-MM-DD (default today, the local date)")(
            "gate", po::bool_switch(), "exit with status 1 when the check fails");
        add_format_option(d);
        p.add("instrument", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        const auto format = format_of(vm, {"text", "json"});
        const checks::Procedure procedure = checks::parse_procedure(vm["procedure"].as<std::string>());
        refuse_other_procedures_options(vm, procedure);
        switch (procedure) {
          case checks::Procedure::repeatability:
            return record_weekly_check(vm, env, format);
          case checks::Procedure::calibration:
            return record_calibration(vm, env, format);
          case checks::Procedure::gravimetric:
            return record_pipette(vm, env, format);
        }
        return 3;
      }};
  Command show{
      "check",
      "show",
      "show one check run with its results",
      "plumb check show LAST --format json",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("run", po::value<std::string>()->default_value("LAST"), "run number or LAST")(
            "at", po::value<std::string>(), "calibration: the fitted error at this load, e.g. 120g")(
            "extrapolate", po::bool_switch(), "with --at: show a load outside the calibrated range, marked");
        add_format_option(d);
        p.add("run", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        const auto format = format_of(vm, {"text", "json"});
        if (vm["extrapolate"].as<bool>() && !vm.count("at"))
          throw InputError("--extrapolate applies only with --at LOAD (the load to read the fitted error at).");
        auto db = env.open();
        const auto id = app::resolve_run(db, vm["run"].as<std::string>());
        const auto run = *store::find_run(db.sql(), id);
        if (const auto at = optional_string(vm, "at")) {
          // The answer at that load only, not the whole run around it.
          const auto e = app::calibration_error_at(run, *at, vm["extrapolate"].as<bool>());
          env.out << (format == "json" ? e.dump(2) + "\n" : report::calibration_error_at_text(e));
          return 0;
        }
        // A captured run shows its original record: the lines as the balance sent them.
        const auto lines = store::raw_lines_of(db.sql(), id);
        if (format == "json") {
          auto j = report::run_json(run);
          if (!lines.empty()) j["raw_lines"] = report::raw_lines_json(lines);
          env.out << j.dump(2) << "\n";
        } else {
          print_run(run, format, env);
          env.out << report::raw_lines_text(lines);
        }
        return 0;
      }};
  Command correct{
      "check",
      "correct",
      "correct a run: a new run supersedes it (reason required); the original stays; a certificate is replaced",
      "plumb check correct 12 --readings fixed.csv --reason \"reading 4 mistyped (100.0040 for 100.0004)\"",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("run", po::value<std::string>()->required(), "run number or LAST (positional)")(
            "reason", po::value<std::string>(), "why the run is corrected (required; kept with the correction)")(
            "readings", po::value<std::string>(), "corrected readings CSV (default: the run's readings); - for stdin")(
            "unit", po::value<std::string>()->default_value("g"), "unit of readings without a unit column")(
            "on", po::value<std::string>(), "corrected date performed, YYYY-MM-DD")(
            "operator", po::value<std::string>(),
            "user id of the operator who performed the check, when that was wrong")(
            "weight", po::value<std::vector<std::string>>(), "repeatability: corrected reference weight id")(
            "temperature", po::value<std::string>(), "calibration: corrected air temperature, degC")(
            "pressure", po::value<std::string>(), "calibration and gravimetric: corrected air pressure, hPa")(
            "humidity", po::value<std::string>(), "calibration and gravimetric: corrected relative humidity, %")(
            "air-formula", po::value<std::string>(), "calibration: corrected air density formula")(
            "temperature-u", po::value<std::string>(), "calibration: corrected thermometer standard uncertainty")(
            "pressure-u", po::value<std::string>(), "calibration: corrected barometer standard uncertainty")(
            "humidity-u", po::value<std::string>(), "calibration: corrected hygrometer standard uncertainty")(
            "model", po::value<std::string>(), "calibration: corrected fitted model")(
            "balance", po::value<std::string>(), "gravimetric: corrected balance the water was weighed on")(
            "water-temp", po::value<std::string>(), "gravimetric: corrected water temperature, degC")(
            "evaporation", po::value<std::string>(), "gravimetric: corrected evaporation loss per weighing")(
            "water-temp-u", po::value<std::string>(), "gravimetric: corrected thermometer standard uncertainty")(
            "air-density-u", po::value<std::string>(), "gravimetric: corrected air density standard uncertainty")(
            "layout", po::value<std::string>(),
            "layout of the replacement certificate (default: that of the one it "
            "replaces)");
        add_format_option(d);
        p.add("run", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        const auto format = format_of(vm, {"text", "json"});
        if (!vm.count("reason"))
          throw InputError("--reason must say why the run is corrected (it is kept with the correction).");
        app::CorrectionInput in;
        in.run = vm["run"].as<std::string>();
        in.reason = vm["reason"].as<std::string>();
        if (vm.count("readings")) in.readings_csv = read_input(vm["readings"].as<std::string>(), in.readings_source);
        in.default_unit = parse_mass_unit(vm["unit"].as<std::string>(), "--unit");
        in.on = optional_string(vm, "on");
        const auto operator_id = optional_string(vm, "operator");
        if (vm.count("weight")) in.weight_ids = vm["weight"].as<std::vector<std::string>>();
        for (const std::string_view option : checks::procedure_options()) {
          const std::string name(option);
          if (name != "weight" && vm.count(name)) in.conditions[name] = vm[name].as<std::string>();
        }
        in.layout_path = optional_string(vm, "layout");
        auto db = env.open();
        if (operator_id) {
          const auto user = store::find_user_by_login(db.sql(), *operator_id);
          if (!user) throw InputError(fmt::format("--operator \"{}\" is not a user id of this lab.", *operator_id));
          in.operator_name = user->full_name;
        }
        const auto out = app::correct_check(db, env.actor(db), in);
        if (format == "json") {
          nlohmann::json j = {
              {"original", report::run_json(out.original)},
              {"correction", report::run_json(out.correction)},
              {"superseded_certificate",
               out.superseded_certificate ? nlohmann::json(out.superseded_certificate->number) : nlohmann::json()},
              {"new_certificate",
               out.new_certificate ? nlohmann::json(out.new_certificate->number) : nlohmann::json()}};
          env.out << j.dump(2) << "\n";
          return 0;
        }
        fmt::print(env.out, "Run {} corrected by run {} (reason: {}). Run {} stays in history, marked superseded.\n",
                   out.original.id, out.correction.id, out.correction.reason, out.original.id);
        if (out.new_certificate)
          fmt::print(env.out, "Certificate {} is superseded by certificate {} (a draft until approved).\n",
                     out.superseded_certificate->number, out.new_certificate->number);
        print_run(out.correction, "text", env);
        return 0;
      }};
  Command void_command{
      "check",
      "void",
      "void a run entered in error (reason required): it stays in history, marked void, and stops counting",
      "plumb check void 14 --reason \"entered for BAL-A by mistake; the check was on BAL-B\"",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("run", po::value<std::string>()->required(), "run number or LAST (positional)")(
            "reason", po::value<std::string>(), "why the run is void (required; kept with the run)");
        add_format_option(d);
        p.add("run", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        const auto format = format_of(vm, {"text", "json"});
        if (!vm.count("reason")) throw InputError("--reason must say why the run is void (it is kept with the run).");
        auto db = env.open();
        const auto out = app::void_run(db, env.actor(db), vm["run"].as<std::string>(), vm["reason"].as<std::string>());
        if (format == "json") {
          nlohmann::json j = {
              {"run", report::run_json(out.run)},
              {"withdrawn_certificate",
               out.withdrawn_certificate ? nlohmann::json(out.withdrawn_certificate->number) : nlohmann::json()}};
          env.out << j.dump(2) << "\n";
          return 0;
        }
        fmt::print(env.out,
                   "Run {} ({} of {} on {}) is void: {}. It stays in history and no longer counts for due dates, "
                   "trends or summaries.\n",
                   out.run.id, checks::to_string(out.run.procedure), out.run.instrument_id,
                   to_string(out.run.performed_on), out.run.voided->reason);
        if (out.withdrawn_certificate)
          fmt::print(env.out, "Certificate {} is withdrawn with the same reason.\n", out.withdrawn_certificate->number);
        return 0;
      }};
  return {record, show, correct, void_command};
}

}  // namespace plumb::cli
