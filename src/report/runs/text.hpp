#pragma once
// Plain-text summary of one check run of any procedure (`plumb check show`), chosen by the procedure.
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::report {

/// `run` is the JSON of report::run_json.
std::string run_text(const nlohmann::json& run);

/// The same, with the date of the heading marked as the default a recording took ("on 2026-12-03 (today)"),
/// so that a run recorded without --on says which date it was given.
std::string run_text_dated_today(const nlohmann::json& run);

}  // namespace plumb::report
