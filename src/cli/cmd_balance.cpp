#include <fmt/ostream.h>

#include "app/registry/balances.hpp"
#include "app/status/due.hpp"
#include "cli/command_groups.hpp"
#include "cli/instrument_options.hpp"
#include "report/registry/lists.hpp"
#include "store/repository.hpp"

namespace plumb::cli {

std::vector<Command> balance_commands() {
  Command add{"balance",
              "add",
              "register a balance, its check interval and its tolerance policy",
              "plumb balance add BAL-A --capacity 220g --readability 0.1mg --every 7d --smallest-net 200mg "
              "--location \"Room 2\"",
              [](po::options_description& d, po::positional_options_description& p) {
                d.add_options()("id", po::value<std::string>()->required(), "balance id (positional)")(
                    "capacity", po::value<std::string>()->required(), "maximum capacity, e.g. 220g")(
                    "readability", po::value<std::string>()->required(), "readability d (scale interval), e.g. 0.1mg")(
                    "every", po::value<std::string>()->required(), "check interval: 7d, 4w, 6mo, 1y")(
                    "smallest-net", po::value<std::string>(),
                    "smallest net weight the lab weighs on it (USP <41> repeatability)")(
                    "max-bias", po::value<std::string>(), "lab's own accuracy limit |bias| (replaces USP <41>)")(
                    "max-sd", po::value<std::string>(), "lab's own repeatability limit s (replaces USP <41>)")(
                    "location", po::value<std::string>()->default_value(""), "where it stands")(
                    "since", po::value<std::string>(), "in use since (first check due), default today");
                add_identity_options(d);
                p.add("id", 1);
              },
              [](const po::variables_map& vm, Env& env) {
                app::BalanceInput in;
                in.id = vm["id"].as<std::string>();
                in.capacity = vm["capacity"].as<std::string>();
                in.readability = vm["readability"].as<std::string>();
                in.every = vm["every"].as<std::string>();
                in.location = vm["location"].as<std::string>();
                in.smallest_net = optional_string(vm, "smallest-net");
                in.max_bias = optional_string(vm, "max-bias");
                in.max_sd = optional_string(vm, "max-sd");
                in.since = optional_string(vm, "since");
                in.identity = identity_from(vm);
                auto db = env.open();
                const auto b = app::add_balance(db, env.actor(db), in);
                fmt::print(env.out, "Balance {} registered: capacity {}, d = {}, checked every {} under {}.\n", b.id,
                           b.capacity.to_string(), b.readability.to_string(), b.every.to_string(), b.policy.name());
                return 0;
              }};
  Command list{
      "balance",
      "list",
      "list balances",
      "plumb balance list",
      [](po::options_description& d, po::positional_options_description&) { add_format_option(d, "text|json|csv"); },
      [](const po::variables_map& vm, Env& env) {
        const auto format = format_of(vm, {"text", "json", "csv"});
        auto db = env.open();
        const auto balances = store::list_balances(db.sql());
        const auto status = app::instrument_standings(db, today_local());
        if (format == "json")
          env.out << report::balances_json(balances, status).dump(2) << "\n";
        else if (format == "csv")
          env.out << report::balances_csv(balances, status);
        else
          env.out << report::balances_text(balances, status);
        return 0;
      }};
  return {add, list, instrument_show_command("balance", "BAL-A")};
}

}  // namespace plumb::cli
