#include <fmt/ostream.h>

#include "app/registry/instrument_attributes.hpp"
#include "cli/command_groups.hpp"
#include "cli/instrument_options.hpp"
#include "core/errors.hpp"

namespace plumb::cli {

std::vector<Command> instrument_commands() {
  Command update{
      "instrument", "update",
      "record a change of an instrument's attributes (identity, location, interval, policy) from a date, with why",
      "plumb instrument update BAL-A --location \"Room 5\" --from 2026-12-01 --reason \"moved to the new weighing "
      "room\"",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("id", po::value<std::string>()->required(), "instrument id (positional)")(
            "location", po::value<std::string>(), "where it stands from now on")(
            "every", po::value<std::string>(), "new check interval: 7d, 4w, 6mo, 1y")(
            "policy", po::value<std::string>(), "balances: weekly-check policy usp41 or lab")(
            "smallest-net", po::value<std::string>(), "balances: smallest net weight (USP <41>)")(
            "max-bias", po::value<std::string>(), "balances: lab's accuracy limit |bias|")(
            "max-sd", po::value<std::string>(), "balances: lab's repeatability limit s")(
            "min-readings", po::value<std::string>(), "balances, lab policy: replicate weighings a check needs")(
            "from", po::value<std::string>(), "the date the change holds from (default today)")(
            "reason", po::value<std::string>(), "why (required; kept in the record)");
        add_identity_options(d);
        p.add("id", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        app::AttributeChangeInput in;
        in.id = vm["id"].as<std::string>();
        in.identity = identity_from(vm);
        in.location = optional_string(vm, "location");
        in.every = optional_string(vm, "every");
        in.policy = optional_string(vm, "policy");
        in.smallest_net = optional_string(vm, "smallest-net");
        in.max_bias = optional_string(vm, "max-bias");
        in.max_sd = optional_string(vm, "max-sd");
        in.min_readings = optional_string(vm, "min-readings");
        in.from = optional_string(vm, "from");
        in.reason = optional_string(vm, "reason").value_or("");
        auto db = env.open();
        const auto c = app::change_attributes(db, env.actor(db), in);
        fmt::print(env.out, "{} {} from {}: {} ({}; recorded by {}).\n", c.kind == "balance" ? "Balance" : "Pipette",
                   in.id, to_string(c.after.effective_on), app::describe_change(c.before, c.after), c.after.reason,
                   c.after.recorded_by);
        return 0;
      }};
  return {update};
}

}  // namespace plumb::cli
