#include "app/people/roles.hpp"

#include <fmt/format.h>

#include "core/errors.hpp"
#include "core/text_field.hpp"

namespace plumb::app {

std::string_view role_name(Role r) {
  switch (r) {
    case Role::technician:
      return "technician";
    case Role::reviewer:
      return "reviewer";
    case Role::quality_manager:
      return "quality manager";
    case Role::administrator:
      return "administrator";
  }
  return "";
}

std::optional<Role> role_from_stored(const std::string& text) {
  for (Role r : {Role::technician, Role::reviewer, Role::quality_manager, Role::administrator})
    if (role_name(r) == text) return r;
  return std::nullopt;
}

Role parse_role(const std::string& text, const std::string& field) {
  std::string spaced = text;
  for (char& c : spaced)
    if (c == '-' || c == '_') c = ' ';
  if (auto r = role_from_stored(spaced)) return *r;
  throw InputError(
      fmt::format("{} \"{}\" is not a role; the roles are technician, reviewer, quality-manager and "
                  "administrator.",
                  field, shown_on_one_line(text)));
}

}  // namespace plumb::app
