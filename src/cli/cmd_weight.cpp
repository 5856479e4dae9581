#include <fmt/ostream.h>

#include <nlohmann/json.hpp>

#include "app/registry/weights.hpp"
#include "cli/command_groups.hpp"
#include "store/repository.hpp"

namespace plumb::cli {
namespace {

nlohmann::json weight_json(const store::WeightRecord& w) {
  return {{"id", w.id},
          {"nominal", w.nominal_text},
          {"nominal_g", w.nominal.approx().g()},
          {"class", w.weight_class},
          {"conventional_mass_g", w.conventional_mass().approx().g()},
          {"correction_mg", w.current.correction.approx().mg()},
          {"uncertainty_mg", w.current.uncertainty.approx().mg()},
          {"k", w.current.k.to_double()},
          {"certificate", w.current.certificate_no},
          {"calibrated_on", to_string(w.current.calibrated_on)},
          {"due_on", to_string(w.current.due_on)}};
}

}  // namespace

std::vector<Command> weight_commands() {
  Command add{"weight", "add", "register a reference weight with its calibration certificate",
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
                    "density", po::value<std::string>(), "density in kg/m3 (default: 8000, conventional)");
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
               [](po::options_description& d, po::positional_options_description&) { add_format_option(d); },
               [](const po::variables_map& vm, Env& env) {
                 const auto format = format_of(vm, {"text", "json"});
                 auto db = env.open();
                 const auto weights = store::list_weights(db.sql());
                 if (format == "json") {
                   nlohmann::json j = nlohmann::json::array();
                   for (const auto& w : weights) j.push_back(weight_json(w));
                   env.out << j.dump(2) << "\n";
                   return 0;
                 }
                 fmt::print(env.out, "{:<10}{:<10}{:<6}{:<22}{:<14}{:<12}\n", "id", "nominal", "class",
                            "conventional mass (g)", "certificate", "due");
                 for (const auto& w : weights)
                   fmt::print(env.out, "{:<10}{:<10}{:<6}{:<22}{:<14}{:<12}\n", w.id, w.nominal_text, w.weight_class,
                              w.conventional_mass().in_grams().to_string(), w.current.certificate_no,
                              to_string(w.current.due_on));
                 return 0;
               }};
  return {add, list};
}

}  // namespace plumb::cli
