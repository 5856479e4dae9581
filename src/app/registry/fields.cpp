#include "app/registry/fields.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>

#include "core/errors.hpp"
#include "core/text_field.hpp"

namespace plumb::app {

void validate_id(const std::string& id, std::string_view field) {
  check_text_field(id, field);
  const bool ok = !id.empty() && id.size() <= 64 && id != "LAST" &&
                  std::all_of(id.begin(), id.end(),
                              [](unsigned char c) { return std::isalnum(c) || c == '-' || c == '_' || c == '.'; });
  if (!ok)
    throw InputError(fmt::format("{} \"{}\" is not a valid id (1-64 letters, digits, '-', '_' or '.').", field,
                                 shown_on_one_line(id)));
}

void validate_free_text(std::string_view text, std::string_view field, bool required) {
  check_text_field(text, field);
  if (required && text.find_first_not_of(' ') == std::string_view::npos)
    throw InputError(fmt::format("{} is {}; it must say something.", field, text.empty() ? "empty" : "blank"));
}

ExactMass positive_mass(const std::string& text, std::string_view field) {
  const ExactMass m = ExactMass::parse(text, field);
  if (m <= ExactMass{}) throw InputError(fmt::format("{} \"{}\" must be greater than zero.", field, text));
  return m;
}

}  // namespace plumb::app
