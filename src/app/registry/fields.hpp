#pragma once
// Fields of the registry as people type them: identifiers and positive quantities.
#include <string>
#include <string_view>

#include "core/units.hpp"

namespace plumb::app {

/// An identifier: 1-64 characters of letters, digits, '-', '_', '.', not "LAST". InputError naming `field`.
void validate_id(const std::string& id, std::string_view field);

/// A mass with its unit that must be greater than zero (a capacity, a readability, an uncertainty).
ExactMass positive_mass(const std::string& text, std::string_view field);

}  // namespace plumb::app
