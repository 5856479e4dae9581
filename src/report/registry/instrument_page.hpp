#pragma once
// `balance show` / `pipette show` as text, from the page app::instrument_page builds.
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::report {

std::string instrument_page_text(const nlohmann::json& page);

}  // namespace plumb::report
