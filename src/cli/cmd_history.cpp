// The trend commands: history, control-chart, drift, interval-review. Read-only on the database.
#include <fmt/ostream.h>

#include "app/history/trends.hpp"
#include "cli/command_groups.hpp"
#include "report/history/trend_text.hpp"

namespace plumb::cli {
namespace {

void instrument_options(po::options_description& d, po::positional_options_description& p,
                        const std::string& quantities =
                            "balance: bias (default)|sd|min-weight; pipette: relative-systematic-error (default)|"
                            "systematic-error|cv, each optionally @VOLUME[/chN], e.g. cv@10uL/ch2") {
  d.add_options()("instrument", po::value<std::string>()->required(), "instrument id")(
      "quantity", po::value<std::string>()->default_value(""), quantities.c_str())(
      "from", po::value<std::string>(), "first date of the period, YYYY-MM-DD")(
      "to", po::value<std::string>(), "last date of the period, YYYY-MM-DD");
  p.add("instrument", 1);
}

void chart_option(po::options_description& d) {
  d.add_options()("chart", po::value<std::string>(), "also draw the chart to FILE.svg, .png or .pdf")(
      "full-scale", po::bool_switch(),
      "draw the whole tolerance band even when it is over 20 times the span of the data (default: zoom to the "
      "data and mark the limits off scale)");
}

app::TrendRequest trend_request(const po::variables_map& vm) {
  app::TrendRequest r;
  r.instrument = vm["instrument"].as<std::string>();
  r.quantity = vm["quantity"].as<std::string>();
  r.period = app::parse_period(optional_string(vm, "from"), optional_string(vm, "to"));
  if (auto c = optional_string(vm, "chart")) r.chart = *c;
  r.full_scale = vm.count("full-scale") && vm["full-scale"].as<bool>();
  return r;
}

void print_json(Env& env, const nlohmann::json& j) { env.out << j.dump(2) << "\n"; }

void chart_written(Env& env, const app::TrendRequest& r) {
  if (r.chart) fmt::print(env.err, "plumb: chart written to {}\n", r.chart->string());
}

}  // namespace

std::vector<Command> history_commands() {
  Command history{"history", "", "every check run of an instrument with its results (superseded ones marked)",
                  "plumb history AB-01 --format csv --chart ab01-bias.svg --quantity bias",
                  [](po::options_description& d, po::positional_options_description& p) {
                    instrument_options(d, p);
                    chart_option(d);
                    add_format_option(d, "text|csv|json");
                  },
                  [](const po::variables_map& vm, Env& env) {
                    const auto format = format_of(vm, {"text", "csv", "json"});
                    const auto request = trend_request(vm);
                    auto db = env.open();
                    const auto view = app::history(db, request);
                    if (format == "json")
                      print_json(env, report::history_json(view));
                    else
                      env.out << (format == "csv" ? report::history_csv(view) : report::history_text(view));
                    chart_written(env, request);
                    return 0;
                  }};
  Command control{"control-chart", "",
                  "individuals control chart of a result with Western Electric rule signals explained",
                  "plumb control-chart AB-01 --quantity sd --baseline 20 --chart ab01-sd.png",
                  [](po::options_description& d, po::positional_options_description& p) {
                    instrument_options(d, p);
                    d.add_options()("baseline", po::value<std::size_t>(), "the first N results set the limits (default 20)")(
                        "baseline-from", po::value<std::string>(), "or: the results from this date ...")(
                        "baseline-to", po::value<std::string>(), "... to this date set the limits");
                    chart_option(d);
                    add_format_option(d);
                  },
                  [](const po::variables_map& vm, Env& env) {
                    const auto format = format_of(vm, {"text", "json"});
                    app::ControlChartRequest request{trend_request(vm), std::nullopt, optional_string(vm, "baseline-from"),
                                                     optional_string(vm, "baseline-to")};
                    if (vm.count("baseline")) request.baseline_count = vm["baseline"].as<std::size_t>();
                    auto db = env.open();
                    const auto view = app::control_chart(db, request);
                    if (format == "json")
                      print_json(env, report::control_chart_json(view));
                    else
                      env.out << report::control_chart_text(view);
                    chart_written(env, request.trend);
                    return 0;
                  }};
  Command drift{"drift", "",
                "least-squares drift of a result over time and the projected date of reaching its tolerance",
                "plumb drift AB-01 --quantity bias --chart ab01-drift.pdf",
                [](po::options_description& d, po::positional_options_description& p) {
                  instrument_options(d, p);
                  chart_option(d);
                  add_format_option(d);
                },
                [](const po::variables_map& vm, Env& env) {
                  const auto format = format_of(vm, {"text", "json"});
                  const auto request = trend_request(vm);
                  auto db = env.open();
                  const auto view = app::drift(db, request);
                  if (format == "json")
                    print_json(env, report::drift_json(view));
                  else
                    env.out << report::drift_text(view);
                  chart_written(env, request);
                  return 0;
                }};
  Command review{"interval-review", "",
                 "recommend lengthening, keeping or shortening the check interval (OIML D 10 / ILAC G24)",
                 "plumb interval-review AB-01 --quantity bias",
                 [](po::options_description& d, po::positional_options_description& p) {
                   instrument_options(d, p);
                   add_format_option(d);
                 },
                 [](const po::variables_map& vm, Env& env) {
                   const auto format = format_of(vm, {"text", "json"});
                   const auto request = trend_request(vm);
                   auto db = env.open();
                   const auto view = app::interval_review(db, request);
                   if (format == "json")
                     print_json(env, report::interval_review_json(view));
                   else
                     env.out << report::interval_review_text(view);
                   return 0;
                 }};
  return {history, control, drift, review};
}

}  // namespace plumb::cli
