#include <fmt/ostream.h>

#include <nlohmann/json.hpp>

#include "app/pipette/edition.hpp"
#include "app/pipette/registry.hpp"
#include "app/status/due.hpp"
#include "cli/command_groups.hpp"
#include "cli/instrument_options.hpp"
#include "store/pipettes.hpp"
#include "store/repository.hpp"

namespace plumb::cli {
namespace {

std::string range_text(const checks::PipetteDefinition& d) {
  if (d.kind == checks::PipetteKind::fixed) return fmt::format("fixed {} uL", d.nominal.in_microlitres().to_string());
  return fmt::format("{}-{} uL", d.lower_limit->in_microlitres().to_string(), d.nominal.in_microlitres().to_string());
}

}  // namespace

std::vector<Command> pipette_commands() {
  Command add{"pipette",
              "add",
              "register a piston pipette, its check interval and the limits it is judged by",
              "plumb pipette add P-07 --nominal 100uL --range 10uL-100uL --channels 1 --every 3mo --location \"Lab 2\"",
              [](po::options_description& d, po::positional_options_description& p) {
                d.add_options()("id", po::value<std::string>()->required(), "pipette id (positional)")(
                    "nominal", po::value<std::string>()->required(),
                    "nominal volume, e.g. 100uL or 1mL (the largest selectable volume of a variable pipette)")(
                    "range", po::value<std::string>()->required(),
                    "adjustable range LOWER-UPPER ending at the nominal volume, e.g. 10uL-100uL; or fixed")(
                    "channels", po::value<std::string>()->default_value("1"), "number of channels (1 to 384)")(
                    "every", po::value<std::string>()->required(), "check interval: 3mo, 6mo, 1y")(
                    "max-systematic", po::value<std::string>(),
                    "lab's own limit on |systematic error|, in uL or % of the selected volume (replaces ISO 8655-2)")(
                    "max-random", po::value<std::string>(),
                    "lab's own limit on the random error: SD in uL, or CV in % (replaces ISO 8655-2)")(
                    "location", po::value<std::string>()->default_value(""), "where it is kept")(
                    "since", po::value<std::string>(), "in use since (first check due), default today");
                add_identity_options(d);
                p.add("id", 1);
              },
              [](const po::variables_map& vm, Env& env) {
                app::PipetteInput in;
                in.id = vm["id"].as<std::string>();
                in.nominal = vm["nominal"].as<std::string>();
                in.range = vm["range"].as<std::string>();
                in.channels = vm["channels"].as<std::string>();
                in.every = vm["every"].as<std::string>();
                in.location = vm["location"].as<std::string>();
                in.max_systematic = optional_string(vm, "max-systematic");
                in.max_random = optional_string(vm, "max-random");
                in.since = optional_string(vm, "since");
                in.identity = identity_from(vm);
                auto db = env.open();
                const auto p = app::add_pipette(db, env.actor(db), in);
                const auto volumes = checks::default_test_volumes(p.definition);
                std::string tested;
                for (const auto& v : volumes) tested += (tested.empty() ? "" : ", ") + v.to_string();
                fmt::print(env.out,
                           "Pipette {} registered: {}, {} channel(s), checked every {} under {}; test volumes {}.\n",
                           p.id(), range_text(p.definition), p.definition.channels, p.every.to_string(),
                           app::limits_summary(p.definition.limits), tested);
                return 0;
              }};
  Command list{"pipette",
               "list",
               "list pipettes",
               "plumb pipette list --format json",
               [](po::options_description& d, po::positional_options_description&) { add_format_option(d); },
               [](const po::variables_map& vm, Env& env) {
                 const auto format = format_of(vm, {"text", "json"});
                 auto db = env.open();
                 const auto pipettes = store::list_pipettes(db.sql());
                 const auto status = app::instrument_standings(db, today_local());
                 const auto status_of = [&](const std::string& id) {
                   const auto it = status.find(id);
                   return it == status.end() ? std::string() : it->second;
                 };
                 if (format == "json") {
                   nlohmann::json j = nlohmann::json::array();
                   for (const auto& p : pipettes) {
                     const auto& d = p.definition;
                     j.push_back({{"id", d.id},
                                  {"location", p.location},
                                  {"kind", std::string(checks::to_string(d.kind))},
                                  {"nominal_ul", d.nominal.approx().ul()},
                                  {"lower_limit_ul",
                                   d.lower_limit ? nlohmann::json(d.lower_limit->approx().ul()) : nlohmann::json()},
                                  {"channels", d.channels},
                                  {"every", p.every.to_string()},
                                  {"policy", d.limits.key()},
                                  {"limits", app::limits_summary(d.limits)},
                                  {"status", status_of(d.id)}});
                   }
                   env.out << j.dump(2) << "\n";
                   return 0;
                 }
                 fmt::print(env.out, "{:<10}{:<18}{:<10}{:<8}{:<36}{:<16}{}\n", "id", "volume", "channels", "every",
                            "limits", "status", "location");
                 for (const auto& p : pipettes)
                   fmt::print(env.out, "{:<10}{:<18}{:<10}{:<8}{:<36}{:<16}{}\n", p.id(), range_text(p.definition),
                              p.definition.channels, p.every.to_string(), app::limits_summary(p.definition.limits),
                              status_of(p.id()), p.location);
                 return 0;
               }};
  Command set_edition{
      "pipette",
      "set-edition",
      "choose the edition of ISO 8655 a pipette is checked to (2002 or 2022); its runs are held to that edition",
      "plumb pipette set-edition P-07 --edition 2022 --reason \"the lab moves to the 2022 editions\"",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("id", po::value<std::string>()->required(), "pipette id (positional)")(
            "edition", po::value<std::string>()->required(), "2002 | 2022")(
            "reason", po::value<std::string>(), "why the edition is chosen or changed (kept with it)");
        p.add("id", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        auto db = env.open();
        const auto e =
            app::set_pipette_edition(db, env.actor(db), vm["id"].as<std::string>(), vm["edition"].as<std::string>(),
                                     optional_string(vm, "reason").value_or(""));
        fmt::print(env.out, "Pipette {} is checked to ISO 8655:{} from now on (row {}).\n", e.pipette_id, e.edition,
                   e.id);
        return 0;
      }};
  Command set_default_edition{
      "pipette",
      "default-edition",
      "choose the lab's default edition of ISO 8655 (2002 or 2022), for every pipette without an edition of its own",
      "plumb pipette default-edition --edition 2022 --reason \"the lab moves to the 2022 editions\"",
      [](po::options_description& d, po::positional_options_description&) {
        d.add_options()("edition", po::value<std::string>()->required(), "2002 | 2022")(
            "reason", po::value<std::string>(), "why the default is chosen or changed (kept with it)");
      },
      [](const po::variables_map& vm, Env& env) {
        auto db = env.open();
        const auto e = app::set_lab_pipette_edition(db, env.actor(db), vm["edition"].as<std::string>(),
                                                    optional_string(vm, "reason").value_or(""));
        fmt::print(env.out,
                   "Pipettes without an edition of their own are checked to ISO 8655:{} from now on (row {}).\n",
                   e.edition, e.id);
        return 0;
      }};
  return {add, list, set_edition, set_default_edition, instrument_show_command("pipette", "P-07")};
}

}  // namespace plumb::cli
