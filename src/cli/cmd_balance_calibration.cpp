#include <fmt/ostream.h>

#include "app/calibration/settings.hpp"
#include "cli/command_groups.hpp"

namespace plumb::cli {

std::vector<Command> balance_calibration_commands() {
  Command set{"balance", "set-calibration",
              "set how a balance is calibrated: accuracy class, e, tolerance, decision rule, calibration interval",
              "plumb balance set-calibration BAL-A --class I --e 1mg --tolerance r76 --decision-rule guard-band "
              "--calibrate-every 1y",
              [](po::options_description& d, po::positional_options_description& p) {
                d.add_options()("id", po::value<std::string>()->required(), "balance id (positional)")(
                    "class", po::value<std::string>(), "OIML R 76 accuracy class: I, II, III, IIII")(
                    "e", po::value<std::string>(), "verification scale interval e (default d), e.g. 1mg")(
                    "tolerance", po::value<std::string>()->default_value("r76"),
                    "tolerance on the error of indication: r76 (MPE in service) | usp41 (0.10 %) | lab")(
                    "lab-limit", po::value<std::string>(), "lab: +/- limit on the error, e.g. 0.5mg")(
                    "lab-percent", po::value<std::string>(), "lab: +/- limit in percent of the load")(
                    "decision-rule", po::value<std::string>()->default_value("simple"),
                    "ILAC G8 decision rule: simple | guard-band (w = U)")(
                    "calibrate-every", po::value<std::string>()->default_value("1y"),
                    "calibration interval (weekly checks keep --every of balance add)")(
                    "since", po::value<std::string>(), "first calibration due on this date (default today)");
                p.add("id", 1);
              },
              [](const po::variables_map& vm, Env& env) {
                app::CalibrationSettingsInput in;
                in.instrument_id = vm["id"].as<std::string>();
                in.accuracy_class = optional_string(vm, "class");
                in.e = optional_string(vm, "e");
                in.tolerance = vm["tolerance"].as<std::string>();
                in.lab_limit = optional_string(vm, "lab-limit");
                in.lab_percent = optional_string(vm, "lab-percent");
                in.decision_rule = vm["decision-rule"].as<std::string>();
                in.calibrate_every = vm["calibrate-every"].as<std::string>();
                in.since = optional_string(vm, "since");
                auto db = env.open();
                const auto s = app::set_calibration_settings(db, env.actor(db), in);
                fmt::print(env.out, "Calibration settings of {} (row {}): {}.\n", s.instrument_id, s.id,
                           app::describe(s));
                return 0;
              }};
  return {set};
}

}  // namespace plumb::cli
