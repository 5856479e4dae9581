#pragma once
// Who may run which command: the one table of permissions (permissions.cpp), by command as typed ("check
// record"). A command that writes and is not in the table is refused, so a new command cannot slip through.
#include <string>

#include "app/people/roles.hpp"

namespace plumb::app {

struct Permission {
  const char* command;  ///< "noun verb" or "noun"
  Roles roles;          ///< any one of these; empty: every authenticated user (log-in, own password)
  bool signs = false;   ///< an electronic signature: the password must be entered for this very command
};

/// The row of `command`; nullptr when the command is not in the table.
const Permission* permission_of(const std::string& command);

/// AccessError unless one of `held` allows `command`, naming the roles that would.
void require_permission(const std::string& command, const Roles& held, const std::string& login);

}  // namespace plumb::app
