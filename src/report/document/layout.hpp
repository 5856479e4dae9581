#pragma once
// The lab-adaptable certificate layout (reports/layout.json): address, accreditation text, logo,
// signatories and the caution line. The built-in default is compiled from reports/layout.json.
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <string_view>

namespace plumb::report {

/// Loads the layout from `path` if given, else $PLUMB_LAYOUT, else the built-in default. Missing keys
/// take the default's values. InputError naming the file and the field when the file is unreadable, not valid
/// JSON, or not a layout (validate_layout).
nlohmann::json load_layout(const std::optional<std::string>& path);

/// Refuses, naming `file` and the field, what a certificate could not be drawn from: a key that is not one of
/// the layout's (comment, address_lines, customer, accreditation, logo_png, signatories, caution), a value of the wrong
/// type, text that is not plain text on one line (core/text_field.hpp), and a logo that is not a readable PNG.
void validate_layout(const nlohmann::json& layout, std::string_view file);

}  // namespace plumb::report
