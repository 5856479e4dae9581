#include <fmt/ostream.h>

#include <fstream>
#include <iostream>
#include <sstream>

#include "app/correct_check.hpp"
#include "app/record_check.hpp"
#include "cli/command_groups.hpp"
#include "core/errors.hpp"
#include "report/check_json.hpp"
#include "report/check_text.hpp"
#include "store/repository.hpp"

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
  if (format == "json") env.out << j.dump(2) << "\n";
  else env.out << report::run_text(j);
}

}  // namespace

std::vector<Command> check_commands() {
  Command record{
      "check", "record", "record a check run from readings, compute and judge it, schedule the next",
      "plumb check record BAL-A --procedure repeatability --weight W100 --readings readings.csv --on 2026-11-30 "
      "--by \"A. Technician\"",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("instrument", po::value<std::string>()->required(), "instrument id (positional)")(
            "procedure", po::value<std::string>()->default_value("repeatability"), "check procedure: repeatability")(
            "weight", po::value<std::vector<std::string>>()->required(), "reference weight id")(
            "readings", po::value<std::string>()->required(),
            "CSV with a header and a `reading` column (optional `unit`); - for standard input")(
            "unit", po::value<std::string>()->default_value("g"), "unit of readings without a unit column")(
            "on", po::value<std::string>()->required(), "date performed, YYYY-MM-DD")(
            "gate", po::bool_switch(), "exit with status 1 when the check fails");
        add_format_option(d);
        add_by_option(d, "the operator who performed the check");
        p.add("instrument", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        const auto format = format_of(vm, {"text", "json"});
        app::CheckInput in;
        in.instrument_id = vm["instrument"].as<std::string>();
        in.procedure = vm["procedure"].as<std::string>();
        in.weight_ids = vm["weight"].as<std::vector<std::string>>();
        in.default_unit = parse_mass_unit(vm["unit"].as<std::string>(), "--unit");
        in.readings_csv = read_input(vm["readings"].as<std::string>(), in.readings_source);
        in.on = vm["on"].as<std::string>();
        if (!vm.count("by")) throw InputError("--by must name the operator who performed the check.");
        in.operator_name = vm["by"].as<std::string>();
        auto db = env.open();
        const auto run = app::record_check(db, Env::actor(vm), in);
        print_run(run, format, env);
        return vm["gate"].as<bool>() && run.verdict == Verdict::fail ? 1 : 0;
      }};
  Command show{"check", "show", "show one check run with its results", "plumb check show LAST --format json",
               [](po::options_description& d, po::positional_options_description& p) {
                 d.add_options()("run", po::value<std::string>()->default_value("LAST"), "run number or LAST");
                 add_format_option(d);
                 p.add("run", 1);
               },
               [](const po::variables_map& vm, Env& env) {
                 const auto format = format_of(vm, {"text", "json"});
                 auto db = env.open();
                 const auto id = app::resolve_run(db, vm["run"].as<std::string>());
                 print_run(*store::find_run(db.sql(), id), format, env);
                 return 0;
               }};
  Command correct{
      "check", "correct",
      "correct a run: a new run supersedes it (reason required); the original stays; a certificate is replaced",
      "plumb check correct 12 --readings fixed.csv --reason \"reading 4 mistyped (100.0040 for 100.0004)\" --by \"Q. "
      "Manager\"",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("run", po::value<std::string>()->required(), "run number or LAST (positional)")(
            "reason", po::value<std::string>(), "why the run is corrected (required; kept with the correction)")(
            "readings", po::value<std::string>(), "corrected readings CSV (default: the run's readings); - for stdin")(
            "unit", po::value<std::string>()->default_value("g"), "unit of readings without a unit column")(
            "on", po::value<std::string>(), "corrected date performed, YYYY-MM-DD")(
            "operator", po::value<std::string>(), "corrected name of the operator who performed the check")(
            "weight", po::value<std::vector<std::string>>(), "corrected reference weight id")(
            "layout", po::value<std::string>(), "layout of the replacement certificate, if one is issued");
        add_format_option(d);
        add_by_option(d, "the person making the correction");
        p.add("run", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        const auto format = format_of(vm, {"text", "json"});
        if (!vm.count("reason")) throw InputError("--reason must say why the run is corrected (it is kept with the correction).");
        if (!vm.count("by")) throw InputError("--by must name the person making the correction.");
        app::CorrectionInput in;
        in.run = vm["run"].as<std::string>();
        in.reason = vm["reason"].as<std::string>();
        if (vm.count("readings")) in.readings_csv = read_input(vm["readings"].as<std::string>(), in.readings_source);
        in.default_unit = parse_mass_unit(vm["unit"].as<std::string>(), "--unit");
        in.on = optional_string(vm, "on");
        in.operator_name = optional_string(vm, "operator");
        if (vm.count("weight")) in.weight_ids = vm["weight"].as<std::vector<std::string>>();
        in.layout_path = optional_string(vm, "layout");
        auto db = env.open();
        const auto out = app::correct_check(db, Env::actor(vm), in);
        if (format == "json") {
          nlohmann::json j = {{"original", report::run_json(out.original)},
                              {"correction", report::run_json(out.correction)},
                              {"superseded_certificate", out.superseded_certificate
                                                             ? nlohmann::json(out.superseded_certificate->number)
                                                             : nlohmann::json()},
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
  return {record, show, correct};
}

}  // namespace plumb::cli
