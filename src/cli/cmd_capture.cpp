#include <fmt/ostream.h>
#include <unistd.h>

#include <array>
#include <fstream>
#include <functional>
#include <iterator>
#include <memory>

#include "app/calibration/capture.hpp"
#include "app/pipette/capture.hpp"
#include "app/weekly_check/capture.hpp"
#include "capture/byte_source.hpp"
#include "capture/calibration_session.hpp"
#include "capture/pipette_session.hpp"
#include "capture/weekly_session.hpp"
#include "cli/command_groups.hpp"
#include "core/errors.hpp"
#include "report/runs/json.hpp"
#include "report/runs/text.hpp"

namespace plumb::cli {
namespace {

/// The options each captured procedure takes beyond the common ones; one given to another procedure is refused.
struct CaptureOption {
  const char* name;
  checks::Procedure procedure;
  std::optional<checks::Procedure> also = std::nullopt;
};
const std::array capture_options{
    CaptureOption{"weight", checks::Procedure::repeatability},
    CaptureOption{"count", checks::Procedure::repeatability},
    CaptureOption{"balance", checks::Procedure::gravimetric},
    CaptureOption{"replicates", checks::Procedure::gravimetric},
    CaptureOption{"evaporation", checks::Procedure::gravimetric},
    CaptureOption{"evaporation-blank", checks::Procedure::gravimetric},
    CaptureOption{"water-temp-u", checks::Procedure::gravimetric},
    CaptureOption{"air-density-u", checks::Procedure::gravimetric},
    CaptureOption{"pressure", checks::Procedure::gravimetric, checks::Procedure::calibration},
    CaptureOption{"humidity", checks::Procedure::gravimetric, checks::Procedure::calibration},
    CaptureOption{"plan", checks::Procedure::calibration},
    CaptureOption{"temperature", checks::Procedure::calibration},
    CaptureOption{"temperature-u", checks::Procedure::calibration},
    CaptureOption{"pressure-u", checks::Procedure::calibration},
    CaptureOption{"humidity-u", checks::Procedure::calibration},
    CaptureOption{"air-formula", checks::Procedure::calibration},
    CaptureOption{"model", checks::Procedure::calibration},
};

void refuse_other_capture_options(const po::variables_map& vm, checks::Procedure procedure) {
  for (const auto& o : capture_options) {
    if (o.procedure == procedure || o.also == procedure || !vm.count(o.name) || vm[o.name].defaulted()) continue;
    if (const auto* flag = boost::any_cast<bool>(&vm[o.name].value()); flag && !*flag) continue;
    throw InputError(
        fmt::format("--{} does not apply to capturing --procedure {} (it is an option of --procedure {}).", o.name,
                    checks::to_string(procedure),
                    o.also ? fmt::format("{} or {}", checks::to_string(o.procedure), checks::to_string(*o.also))
                           : std::string(checks::to_string(o.procedure))));
  }
}

std::unique_ptr<capture::ByteSource> open_source(const std::string& from,
                                                 const std::optional<store::BalancePort>& settings,
                                                 const std::string& balance_id, Env& env) {
  if (from == "typed") return nullptr;
  if (from != "port") return capture::open_path_source(from);
  if (!settings)
    throw InputError(
        fmt::format("--from port: balance {} has no port settings; set them with `plumb balance port "
                    "{} --device ...`, or read another --from.",
                    balance_id, balance_id));
  std::string note;
  auto port = capture::open_port_source(*settings, note);
  if (!note.empty()) fmt::print(env.out, "{}\n", note);
  return port;
}

/// Prints the recorded run, or says why the capture ended short; the exit status.
int finish(const capture::SessionResult& result, const std::function<store::RunRecord()>& record,
           const po::variables_map& vm, const std::string& format, Env& env) {
  if (result.end != capture::SessionEnd::complete) {
    env.out.flush();
    env.err << "plumb: " << result.why << "\n";
    return result.end == capture::SessionEnd::interrupted ? 130 : 2;
  }
  const auto run = record();
  const auto j = report::run_json(run);
  if (format == "json")
    env.out << j.dump(2) << "\n";
  else
    env.out << (vm.count("on") ? report::run_text(j) : report::run_text_dated_today(j));
  return vm["gate"].as<bool>() && run.verdict == Verdict::fail ? 1 : 0;
}

int capture_weekly_check(const po::variables_map& vm, Env& env, const std::string& format) {
  app::CaptureInput in;
  in.check.instrument_id = vm["instrument"].as<std::string>();
  if (vm.count("weight")) in.check.weight_ids = vm["weight"].as<std::vector<std::string>>();
  in.check.on = vm.count("on") ? vm["on"].as<std::string>() : to_string(today_local());
  in.unit = parse_mass_unit(vm["unit"].as<std::string>(), "--unit");
  in.count = vm["count"].as<int>();
  const std::string from = vm["from"].as<std::string>();
  if (from != "typed") in.source = from;
  auto db = env.open();
  // Who weighs is known before the first reading: the authenticated user performed the check.
  const auto actor = env.actor(db);
  in.check.operator_name = actor.name;
  app::WeeklyCapture capture(db, in);
  const auto port = open_source(from, capture.port(), capture.balance().id, env);
  const auto result = capture::run_weekly_session(capture, port.get(), STDIN_FILENO, env.out);
  return finish(
      result, [&] { return capture.record(actor); }, vm, format, env);
}

std::string required_option(const po::variables_map& vm, const char* name, const char* what) {
  if (!vm.count(name))
    throw InputError(fmt::format("--{} is required to capture a gravimetric check: {}.", name, what));
  return vm[name].as<std::string>();
}

int capture_pipette_check(const po::variables_map& vm, Env& env, const std::string& format) {
  app::PipetteCaptureInput in;
  in.check.pipette_id = vm["instrument"].as<std::string>();
  in.check.balance_id = required_option(vm, "balance", "the balance the water is weighed on");
  in.check.pressure = required_option(vm, "pressure", "the air pressure, e.g. 1013hPa");
  in.check.humidity = required_option(vm, "humidity", "the relative humidity, e.g. 50%");
  in.check.evaporation = optional_string(vm, "evaporation");
  in.check.water_temperature_u = optional_string(vm, "water-temp-u");
  in.check.air_density_u = optional_string(vm, "air-density-u");
  in.check.on = vm.count("on") ? vm["on"].as<std::string>() : to_string(today_local());
  in.evaporation_blank = vm["evaporation-blank"].as<bool>();
  in.replicates = vm["replicates"].as<int>();
  in.unit = parse_mass_unit(vm["unit"].as<std::string>(), "--unit");
  const std::string from = vm["from"].as<std::string>();
  if (from != "typed") in.source = from;
  auto db = env.open();
  const auto actor = env.actor(db);
  in.check.operator_name = actor.name;
  app::PipetteCapture capture(db, in);
  const auto port = open_source(from, capture.port(), capture.balance().id, env);
  const auto result = capture::run_pipette_session(capture, port.get(), STDIN_FILENO, env.out);
  return finish(
      result, [&] { return capture.record(actor); }, vm, format, env);
}

int capture_calibration(const po::variables_map& vm, Env& env, const std::string& format) {
  app::CalibrationCaptureInput in;
  in.run.instrument_id = vm["instrument"].as<std::string>();
  if (!vm.count("plan"))
    throw InputError(
        "--plan is required to capture a calibration: the run file's rows without their readings, in "
        "the order they are weighed (header stage,part,load,position,direction).");
  in.plan_source = vm["plan"].as<std::string>();
  std::ifstream plan(in.plan_source, std::ios::binary);
  if (!plan) throw InputError(fmt::format("--plan file \"{}\" cannot be read.", in.plan_source));
  in.plan_text.assign(std::istreambuf_iterator<char>(plan), std::istreambuf_iterator<char>());
  in.run.on = vm.count("on") ? vm["on"].as<std::string>() : to_string(today_local());
  in.run.temperature_c = optional_string(vm, "temperature");
  in.run.pressure_hpa = optional_string(vm, "pressure");
  in.run.humidity_pct = optional_string(vm, "humidity");
  in.run.temperature_u = optional_string(vm, "temperature-u");
  in.run.pressure_u = optional_string(vm, "pressure-u");
  in.run.humidity_u = optional_string(vm, "humidity-u");
  if (vm.count("air-formula")) in.run.air_formula = vm["air-formula"].as<std::string>();
  if (vm.count("model")) in.run.model = vm["model"].as<std::string>();
  in.unit = parse_mass_unit(vm["unit"].as<std::string>(), "--unit");
  const std::string from = vm["from"].as<std::string>();
  if (from != "typed") in.source = from;
  auto db = env.open();
  const auto actor = env.actor(db);
  in.run.operator_name = actor.name;
  app::CalibrationCapture capture(db, in);
  const auto port = open_source(from, capture.port(), capture.balance().id, env);
  const auto result = capture::run_calibration_session(capture, port.get(), STDIN_FILENO, env.out);
  return finish(
      result, [&] { return capture.record(actor); }, vm, format, env);
}

int capture_check(const po::variables_map& vm, Env& env) {
  const auto format = format_of(vm, {"text", "json"});
  const checks::Procedure procedure = checks::parse_procedure(vm["procedure"].as<std::string>());
  refuse_other_capture_options(vm, procedure);
  switch (procedure) {
    case checks::Procedure::repeatability:
      return capture_weekly_check(vm, env, format);
    case checks::Procedure::gravimetric:
      return capture_pipette_check(vm, env, format);
    case checks::Procedure::calibration:
      return capture_calibration(vm, env, format);
  }
  return 2;
}

}  // namespace

std::vector<Command> capture_commands() {
  Command capture{
      "check",
      "capture",
      "take a check at the bench, step by step, from the balance's data output or typed readings",
      "plumb check capture BAL-A --weight W100\n"
      "  plumb check capture BAL-A --weight W100 --from port\n"
      "  plumb check capture BAL-A --weight W100 --from /dev/ttyUSB1\n"
      "  plumb check capture P-07 --procedure gravimetric --balance SM-02 --pressure 1013hPa "
      "--humidity 50% --from port\n"
      "  plumb check capture BAL-A --procedure calibration --plan cal-plan.csv --from port",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("instrument", po::value<std::string>()->required(), "balance or pipette id (positional)")(
            "procedure", po::value<std::string>()->default_value("repeatability"),
            "repeatability (the weekly check), gravimetric (a pipette) or calibration (a balance)")(
            "weight", po::value<std::vector<std::string>>(), "repeatability: reference weight id")(
            "from", po::value<std::string>()->default_value("typed"),
            "typed (readings typed at the prompt), port (the balance's port settings), or a file, FIFO or "
            "pseudo-terminal to read balance lines from")(
            "count", po::value<int>()->default_value(0),
            "repeatability: readings to take (default: the number the balance's policy asks for)")(
            "balance", po::value<std::string>(), "gravimetric: the balance the water is weighed on")(
            "pressure", po::value<std::string>(),
            "gravimetric and calibration: air pressure with its unit, e.g. 1013hPa")(
            "humidity", po::value<std::string>(),
            "gravimetric and calibration: relative humidity with its unit, e.g. 50%")(
            "plan", po::value<std::string>(),
            "calibration: the plan, the run file's rows without readings in the order they are weighed "
            "(stage,part,load,position,direction)")("temperature", po::value<std::string>(),
                                                    "calibration: air temperature with its unit, e.g. 20.3C")(
            "temperature-u", po::value<std::string>(),
            "calibration: standard uncertainty of the air thermometer, e.g. 0.1C")(
            "pressure-u", po::value<std::string>(), "calibration: standard uncertainty of the barometer, e.g. 0.5hPa")(
            "humidity-u", po::value<std::string>(), "calibration: standard uncertainty of the hygrometer, e.g. 2%")(
            "air-formula", po::value<std::string>(), "calibration: cipm2007 (default) | oiml-r111")(
            "model", po::value<std::string>(),
            "calibration: fitted model, line (default) | through-origin | quadratic")(
            "replicates", po::value<int>()->default_value(0),
            "gravimetric: replicates at each test volume and channel (default: what the pipette's "
            "edition of ISO 8655 asks for)")(
            "evaporation", po::value<std::string>(),
            "gravimetric: mass lost by evaporation per weighing, with unit (e.g. 0.01mg)")(
            "evaporation-blank", po::bool_switch(),
            "gravimetric: take the evaporation blank at the bench before the weighings")(
            "water-temp-u", po::value<std::string>(),
            "gravimetric: standard uncertainty of the water thermometer, e.g. 0.05C")(
            "air-density-u", po::value<std::string>(),
            "gravimetric: standard uncertainty of the air density, e.g. 0.005kg/m3")(
            "unit", po::value<std::string>()->default_value("g"),
            "unit of typed bare numbers, and of port lines when the balance has no port settings")(
            "on", po::value<std::string>(), "date performed, YYYY-MM-DD (default today, the local date)")(
            "gate", po::bool_switch(), "exit with status 1 when the check fails");
        add_format_option(d);
        p.add("instrument", 1);
      },
      capture_check};
  return {capture};
}

}  // namespace plumb::cli
