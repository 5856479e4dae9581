#include "app/registry/fields.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>

#include "core/errors.hpp"

namespace plumb::app {

void validate_id(const std::string& id, std::string_view field) {
  const bool ok = !id.empty() && id.size() <= 64 && id != "LAST" &&
                  std::all_of(id.begin(), id.end(), [](unsigned char c) {
                    return std::isalnum(c) || c == '-' || c == '_' || c == '.';
                  });
  if (!ok)
    throw InputError(fmt::format("{} \"{}\" is not a valid id (1-64 letters, digits, '-', '_' or '.').", field, id));
}

ExactMass positive_mass(const std::string& text, std::string_view field) {
  const ExactMass m = ExactMass::parse(text, field);
  if (m <= ExactMass{}) throw InputError(fmt::format("{} \"{}\" must be greater than zero.", field, text));
  return m;
}

}  // namespace plumb::app
