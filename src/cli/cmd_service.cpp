#include <fmt/ostream.h>

#include "app/registry/service_status.hpp"
#include "cli/command_groups.hpp"
#include "core/errors.hpp"

namespace plumb::cli {
namespace {

Command service_command(const std::string& noun, const std::string& verb, const std::string& item_kind,
                        const std::string& event, const std::string& summary, const std::string& example) {
  return {noun, verb, summary, example,
          [noun](po::options_description& d, po::positional_options_description& p) {
            d.add_options()("id", po::value<std::string>()->required(), (noun + " id (positional)").c_str())(
                "reason", po::value<std::string>(), "why (required; kept in the record)");
            p.add("id", 1);
          },
          [item_kind, event](const po::variables_map& vm, Env& env) {
            if (!vm.count("reason")) throw InputError(fmt::format("--reason must say why the item is {}.", event));
            auto db = env.open();
            const auto e = app::change_service_status(db, env.actor(db), item_kind, vm["id"].as<std::string>(), event,
                                                      vm["reason"].as<std::string>());
            fmt::print(env.out, "{} {} {} on {} by {}: {}.\n", item_kind == "weight" ? "Weight" : "Instrument",
                       e.item_id, e.event, e.recorded_at, e.by_name, e.reason);
            return 0;
          }};
}

}  // namespace

std::vector<Command> service_commands() {
  return {
      service_command("instrument", "retire", "instrument", "retired",
                      "take an instrument out of use (kept in history; not due; refused for new checks)",
                      "plumb instrument retire BAL-A --reason \"replaced by BAL-C\""),
      service_command("instrument", "reinstate", "instrument", "reinstated", "bring a retired instrument back into use",
                      "plumb instrument reinstate BAL-A --reason \"repaired and checked\""),
      service_command("weight", "retire", "weight", "retired",
                      "take a reference weight out of use (kept in history; not due; refused for new checks)",
                      "plumb weight retire W100 --reason \"dropped, damaged\""),
      service_command("weight", "reinstate", "weight", "reinstated", "bring a retired reference weight back into use",
                      "plumb weight reinstate W100 --reason \"recalibrated\""),
  };
}

}  // namespace plumb::cli
