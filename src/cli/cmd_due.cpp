#include <fmt/ostream.h>

#include "app/status/due.hpp"
#include "cli/command_groups.hpp"
#include "core/errors.hpp"
#include "report/status/due_list.hpp"

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
                const Date on = vm.count("on") ? parse_date(vm["on"].as<std::string>(), "--on") : today_local();
                const Interval within = Interval::parse(vm["within"].as<std::string>(), "--within");
                const int days = days_between(on, add_interval(on, within));
                auto db = env.open();
                const auto items = app::due_items(db, on, days, vm["all"].as<bool>());
                if (format == "json") env.out << report::due_json(items, on, days).dump(2) << "\n";
                else if (format == "csv") env.out << report::due_csv(items);
                else env.out << report::due_text(items, on, days);
                return 0;
              }};
  return {due};
}

}  // namespace plumb::cli
