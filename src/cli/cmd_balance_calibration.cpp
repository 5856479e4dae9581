#include <fmt/ostream.h>

#include "app/calibration/settings.hpp"
#include "app/registry/in_use.hpp"
#include "cli/command_groups.hpp"
#include "report/calibration/in_use_text.hpp"

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
  Command set_in_use{
      "balance",
      "set-in-use",
      "declare a balance's terms of normal use (EURAMET cg-18 v4.0): rounding, repeatability, temperature, buoyancy, "
      "drift, the form of U(W), the required accuracy and safety factor for the minimum weight",
      "plumb balance set-in-use BAL-A --repeatability 0.12mg --temperature-change 5K --tk 1.5ppm/K "
      "--air-density-u 0.05kg/m3 --drift 10ppm --required-accuracy 0.1% --safety-factor 2",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("id", po::value<std::string>()->required(), "balance id (positional)")(
            "rounding-zero", po::value<std::string>(), "scale interval of the zero indication in use (default d)")(
            "rounding-load", po::value<std::string>(), "scale interval of the loaded indication in use (default d)")(
            "repeatability", po::value<std::string>(), "standard deviation of a single reading in use, e.g. 0.12mg")(
            "temperature-change", po::value<std::string>(), "full width of the temperature change in use, e.g. 5K")(
            "tk", po::value<std::string>(), "sensitivity to temperature, e.g. 1.5ppm/K")(
            "sample-density", po::value<std::string>()->default_value("8000kg/m3"), "density of the samples")(
            "sample-density-u", po::value<std::string>()->default_value("0kg/m3"),
            "standard uncertainty of the sample density")(
            "air-density-u", po::value<std::string>(),
            "standard uncertainty of the air density in use about 1.2 kg/m3, e.g. 0.05kg/m3")(
            "drift", po::value<std::string>(), "largest change of sensitivity since calibration, e.g. 10ppm")(
            "corrected", po::bool_switch(), "weighing results are corrected for the error of indication")(
            "form", po::value<std::string>()->default_value("linear"), "U(W) stated as linear | quadratic-sum")(
            "required-accuracy", po::value<std::string>(), "required relative accuracy of a weighing, e.g. 0.1%")(
            "safety-factor", po::value<std::string>(), "safety factor on the minimum weight, e.g. 2")(
            "reason", po::value<std::string>(), "why the terms are set or changed (kept with them)");
        p.add("id", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        app::InUseTermsInput in;
        in.balance_id = vm["id"].as<std::string>();
        in.rounding_zero = optional_string(vm, "rounding-zero");
        in.rounding_load = optional_string(vm, "rounding-load");
        in.repeatability = optional_string(vm, "repeatability").value_or("");
        in.temperature_change = optional_string(vm, "temperature-change").value_or("");
        in.sensitivity = optional_string(vm, "tk").value_or("");
        in.sample_density = vm["sample-density"].as<std::string>();
        in.sample_density_u = vm["sample-density-u"].as<std::string>();
        in.air_density_u = optional_string(vm, "air-density-u").value_or("");
        in.drift = optional_string(vm, "drift").value_or("");
        in.error_corrected = vm["corrected"].as<bool>();
        in.form = vm["form"].as<std::string>();
        in.required_accuracy = optional_string(vm, "required-accuracy").value_or("");
        in.safety_factor = optional_string(vm, "safety-factor").value_or("");
        in.reason = optional_string(vm, "reason").value_or("");
        auto db = env.open();
        const auto t = app::set_in_use_terms(db, env.actor(db), in);
        fmt::print(env.out, "Terms of normal use of {} (row {}) set; see plumb balance in-use {}.\n", t.balance_id,
                   t.id, t.balance_id);
        return 0;
      }};
  Command in_use{"balance",
                 "in-use",
                 "a balance in normal use: U(W) over the range, the minimum weight from calibration beside the USP "
                 "<41> one, and which a weighing procedure must respect",
                 "plumb balance in-use BAL-A --format json",
                 [](po::options_description& d, po::positional_options_description& p) {
                   d.add_options()("id", po::value<std::string>()->required(), "balance id (positional)")(
                       "on", po::value<std::string>(), "as on this date, YYYY-MM-DD (default today)");
                   add_format_option(d);
                   p.add("id", 1);
                 },
                 [](const po::variables_map& vm, Env& env) {
                   const auto format = format_of(vm, {"text", "json"});
                   const auto on_text = optional_string(vm, "on");
                   const Date on = on_text ? parse_date(*on_text, "--on") : today_local();
                   auto db = env.open();
                   const auto j = app::balance_in_use(db, vm["id"].as<std::string>(), on);
                   env.out << (format == "json" ? j.dump(2) + "\n" : report::balance_in_use_text(j));
                   return 0;
                 }};
  return {set, set_in_use, in_use};
}

}  // namespace plumb::cli
