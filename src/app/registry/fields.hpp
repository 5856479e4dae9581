#pragma once
// Fields as people type them: identifiers, free text and positive quantities. Every input struct's validation
// checks its texts here, so the rule for what may be stored lives in one place (core/text_field.hpp).
#include <string>
#include <string_view>

#include "core/units.hpp"

namespace plumb::app {

/// An identifier: 1-64 characters of letters, digits, '-', '_', '.', not "LAST". InputError naming `field`.
void validate_id(const std::string& id, std::string_view field);

/// Free text (a name, a reason, a location, a certificate number): valid UTF-8 on one line, without control or
/// bidirectional characters; with `required`, also not empty or blank. InputError naming `field`.
void validate_free_text(std::string_view text, std::string_view field, bool required = true);

/// A mass with its unit that must be greater than zero (a capacity, a readability, an uncertainty).
ExactMass positive_mass(const std::string& text, std::string_view field);

}  // namespace plumb::app
