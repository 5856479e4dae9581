#include <fmt/ostream.h>

#include <nlohmann/json.hpp>

#include "app/status/due.hpp"
#include "cli/command_groups.hpp"
#include "core/errors.hpp"

namespace plumb::cli {

std::vector<Command> due_commands() {
  Command due{"due", "", "list what is overdue, out of service, or due within a window",
              "plumb due --within 14d --on 2026-12-01 --format json",
              [](po::options_description& d, po::positional_options_description&) {
                d.add_options()("within", po::value<std::string>()->default_value("14d"), "window: 7d, 2w, 1mo ...")(
                    "on", po::value<std::string>(), "reference date, YYYY-MM-DD (default today)")(
                    "all", po::bool_switch(), "list items in date too");
                add_format_option(d, "text|json|csv");
              },
              [](const po::variables_map& vm, Env& env) {
                const auto format = format_of(vm, {"text", "json", "csv"});
                const Date on = vm.count("on") ? parse_date(vm["on"].as<std::string>(), "--on") : today_utc();
                const Interval within = Interval::parse(vm["within"].as<std::string>(), "--within");
                const int days = days_between(on, add_interval(on, within));
                auto db = env.open();
                const auto items = app::due_items(db, on, days, vm["all"].as<bool>());
                if (format == "json") {
                  nlohmann::json list = nlohmann::json::array();
                  for (const auto& i : items)
                    list.push_back({{"kind", i.kind},
                                    {"id", i.id},
                                    {"location", i.location},
                                    {"status", i.status},
                                    {"due_on", i.due_on ? nlohmann::json(to_string(*i.due_on)) : nlohmann::json()},
                                    {"days_left", i.days_left ? nlohmann::json(*i.days_left) : nlohmann::json()},
                                    {"detail", i.detail}});
                  env.out << nlohmann::json{{"on", to_string(on)}, {"within_days", days}, {"items", list}}.dump(2)
                          << "\n";
                  return 0;
                }
                if (format == "csv") {
                  env.out << "kind,id,status,due_on,days_left,location,detail\n";
                  for (const auto& i : items)
                    fmt::print(env.out, "{},{},{},{},{},\"{}\",\"{}\"\n", i.kind, i.id, i.status,
                               i.due_on ? to_string(*i.due_on) : "", i.days_left ? std::to_string(*i.days_left) : "",
                               i.location, i.detail);
                  return 0;
                }
                fmt::print(env.out, "Due on or before {} ({} days from {}):\n", to_string(add_days(on, days)), days,
                           to_string(on));
                if (items.empty()) fmt::print(env.out, "  nothing is due.\n");
                for (const auto& i : items)
                  fmt::print(env.out, "  {:<12}{:<10}{:<16}{:<12}{:>10}  {}\n", i.kind, i.id, i.status,
                             i.due_on ? to_string(*i.due_on) : "-",
                             i.days_left ? fmt::format("{} d", *i.days_left) : "", i.detail);
                return 0;
              }};
  return {due};
}

}  // namespace plumb::cli
