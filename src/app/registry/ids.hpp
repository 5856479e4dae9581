#pragma once
// The identifiers a lab gives its instruments and weights.
#include <string>
#include <string_view>

namespace plumb::app {

/// An identifier: 1-64 characters of letters, digits, '-', '_', '.', not "LAST". InputError naming `field`.
void validate_id(const std::string& id, std::string_view field);

}  // namespace plumb::app
