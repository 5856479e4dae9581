#pragma once
// The lab-adaptable certificate layout (reports/layout.json): address, accreditation text, logo,
// signatories and the caution line. The built-in default is compiled from reports/layout.json.
#include <nlohmann/json.hpp>
#include <optional>
#include <string>

namespace plumb::report {

/// Loads the layout from `path` if given, else $PLUMB_LAYOUT, else the built-in default. Missing keys
/// take the default's values. InputError when the file is unreadable or not valid JSON.
nlohmann::json load_layout(const std::optional<std::string>& path);

}  // namespace plumb::report
