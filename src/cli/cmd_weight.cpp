#include <fmt/ostream.h>

#include "app/registry/weights.hpp"
#include "cli/command_groups.hpp"
#include "report/registry/lists.hpp"
#include "store/repository.hpp"

namespace plumb::cli {
std::vector<Command> weight_commands() {
  Command add{"weight",
              "add",
              "register a reference weight with its calibration certificate",
              "plumb weight add W100 --nominal 100g --class E2 --correction 0.03mg --uncertainty 0.05mg --k 2 "
              "--certificate RC-2291 --calibrated 2026-03-02 --due 2027-03-02",
              [](po::options_description& d, po::positional_options_description& p) {
                d.add_options()("id", po::value<std::string>()->required(), "weight id (positional)")(
                    "nominal", po::value<std::string>()->required(), "nominal value with unit, e.g. 100g")(
                    "class", po::value<std::string>()->required(), "OIML R 111 class: E1, E2, F1, F2, M1, ...")(
                    "correction", po::value<std::string>()->default_value("0g"),
                    "certificate correction: conventional mass = nominal + correction")(
                    "uncertainty", po::value<std::string>()->required(), "expanded uncertainty U from the certificate")(
                    "k", po::value<std::string>()->default_value("2"), "coverage factor of U")(
                    "certificate", po::value<std::string>()->required(), "calibration certificate number")(
                    "calibrated", po::value<std::string>()->required(), "calibration date, YYYY-MM-DD")(
                    "due", po::value<std::string>()->required(), "recalibration due date, YYYY-MM-DD")(
                    "density", po::value<std::string>(),
                    "density with its unit, e.g. 7950kg/m3 (default: 8000kg/m3, conventional)");
                add_by_option(d);
                p.add("id", 1);
              },
              [](const po::variables_map& vm, Env& env) {
                app::WeightInput in;
                in.id = vm["id"].as<std::string>();
                in.nominal = vm["nominal"].as<std::string>();
                in.weight_class = vm["class"].as<std::string>();
                in.correction = vm["correction"].as<std::string>();
                in.uncertainty = vm["uncertainty"].as<std::string>();
                in.k = vm["k"].as<std::string>();
                in.certificate = vm["certificate"].as<std::string>();
                in.calibrated = vm["calibrated"].as<std::string>();
                in.due = vm["due"].as<std::string>();
                in.density = optional_string(vm, "density");
                auto db = env.open();
                const auto w = app::add_weight(db, Env::actor(vm), in);
                fmt::print(env.out, "Weight {} registered: conventional mass {} g (certificate {}, due {}).\n", w.id,
                           w.conventional_mass().in_grams().to_string(), w.current.certificate_no,
                           to_string(w.current.due_on));
                return 0;
              }};
  Command list{"weight", "list", "list reference weights with their current certificates", "plumb weight list --format json",
               [](po::options_description& d, po::positional_options_description&) { add_format_option(d, "text|json|csv"); },
               [](const po::variables_map& vm, Env& env) {
                 const auto format = format_of(vm, {"text", "json", "csv"});
                 auto db = env.open();
                 const auto weights = store::list_weights(db.sql());
                 if (format == "json") env.out << report::weights_json(weights).dump(2) << "\n";
                 else if (format == "csv") env.out << report::weights_csv(weights);
                 else env.out << report::weights_text(weights);
                 return 0;
               }};
  return {add, list};
}

}  // namespace plumb::cli
