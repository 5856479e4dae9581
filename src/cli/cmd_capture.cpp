#include <fmt/ostream.h>
#include <unistd.h>

#include <memory>

#include "app/weekly_check/capture.hpp"
#include "capture/byte_source.hpp"
#include "capture/weekly_session.hpp"
#include "cli/command_groups.hpp"
#include "core/errors.hpp"
#include "report/runs/json.hpp"
#include "report/runs/text.hpp"

namespace plumb::cli {
namespace {

int capture_weekly_check(const po::variables_map& vm, Env& env) {
  const auto format = format_of(vm, {"text", "json"});
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

  std::unique_ptr<capture::ByteSource> port;
  if (from == "port") {
    if (!capture.port())
      throw InputError(
          fmt::format("--from port: balance {} has no port settings; set them with `plumb balance port "
                      "{} --device ...`, or read another --from.",
                      capture.balance().id, capture.balance().id));
    std::string note;
    port = capture::open_port_source(*capture.port(), note);
    if (!note.empty()) fmt::print(env.out, "{}\n", note);
  } else if (from != "typed") {
    port = capture::open_path_source(from);
  }
  const auto result = capture::run_weekly_session(capture, port.get(), STDIN_FILENO, env.out);
  if (result.end != capture::SessionEnd::complete) {
    env.out.flush();
    env.err << "plumb: " << result.why << "\n";
    return result.end == capture::SessionEnd::interrupted ? 130 : 2;
  }
  const auto run = capture.record(actor);
  const auto j = report::run_json(run);
  if (format == "json")
    env.out << j.dump(2) << "\n";
  else
    env.out << (vm.count("on") ? report::run_text(j) : report::run_text_dated_today(j));
  return vm["gate"].as<bool>() && run.verdict == Verdict::fail ? 1 : 0;
}

}  // namespace

std::vector<Command> capture_commands() {
  Command capture{"check",
                  "capture",
                  "take a weekly check at the bench, step by step, from the balance's data output or typed readings",
                  "plumb check capture BAL-A --weight W100\n"
                  "  plumb check capture BAL-A --weight W100 --from port\n"
                  "  plumb check capture BAL-A --weight W100 --from /dev/ttyUSB1",
                  [](po::options_description& d, po::positional_options_description& p) {
                    d.add_options()("instrument", po::value<std::string>()->required(), "balance id (positional)")(
                        "weight", po::value<std::vector<std::string>>(), "reference weight id")(
                        "from", po::value<std::string>()->default_value("typed"),
                        "typed (readings typed at the prompt), port (the balance's port settings), or a file, FIFO or "
                        "pseudo-terminal to read balance lines from")(
                        "count", po::value<int>()->default_value(0),
                        "readings to take (default: the number the balance's policy asks for)")(
                        "unit", po::value<std::string>()->default_value("g"),
                        "unit of typed bare numbers, and of port lines when the balance has no port settings")(
                        "on", po::value<std::string>(), "date performed, YYYY-MM-DD (default today, the local date)")(
                        "gate", po::bool_switch(), "exit with status 1 when the check fails");
                    add_format_option(d);
                    p.add("instrument", 1);
                  },
                  capture_weekly_check};
  return {capture};
}

}  // namespace plumb::cli
