#pragma once
// Plain-text tables of a full balance calibration, from the JSON stored with the run (report/calibration/json):
// repeatability, eccentricity, the error of indication per load with U and conformity, the fitted model and
// its statistics, and the uncertainty budget of each load. Used by `check show` and the certificate.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

namespace plumb::report {

struct CalibrationTextOptions {
  bool budgets = true;  ///< print the uncertainty budget table of every load
};

/// The tables of one set ("as found" / "as left"); `d_g` is the readability as a decimal string.
std::vector<std::string> calibration_set_lines(const nlohmann::json& set, const std::string& d_g,
                                               const CalibrationTextOptions& options = {});
/// `check show` of a calibration run (`run` as report::run_json gives it).
std::string calibration_run_text(const nlohmann::json& run);
/// `check show N --at LOAD`: the fitted error at one load, the run it comes from and the calibrated loads beside it
/// (`error_at` as app::calibration_error_at gives it).
std::string calibration_error_at_text(const nlohmann::json& error_at);
/// What the four conformity states mean, one sentence each, for the given rule key ("simple", "guard-band").
std::vector<std::string> conformity_state_meanings(const std::string& rule_key);

}  // namespace plumb::report
