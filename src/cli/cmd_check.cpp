#include <fmt/ostream.h>

#include <fstream>
#include <iostream>
#include <sstream>

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
  return {record, show};
}

}  // namespace plumb::cli
