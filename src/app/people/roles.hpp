#pragma once
// The roles a user account can hold (doc/people.md says what each may do; app/people/permissions.cpp is the
// one table of it).
#include <optional>
#include <set>
#include <string>
#include <string_view>

namespace plumb::app {

enum class Role { technician, reviewer, quality_manager, administrator };

/// As stored and typed: "technician", "reviewer", "quality manager", "administrator".
std::string_view role_name(Role r);
/// A role from what was typed ("quality manager" or "quality-manager"); InputError naming `field` otherwise.
Role parse_role(const std::string& text, const std::string& field);
std::optional<Role> role_from_stored(const std::string& text);

using Roles = std::set<Role>;

}  // namespace plumb::app
