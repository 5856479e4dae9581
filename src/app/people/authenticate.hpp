#pragma once
// Who is running a command (21 CFR Part 11 11.10(d), 11.300): a user id with a password checked against its
// Argon2id hash, or a session opened that way (`plumb login`) and not idle past the lab's limit. Every write is
// attributed to the account found here; the table of permissions decides whether it may run the command.
#include <cstdint>
#include <functional>
#include <optional>
#include <string>

#include "app/people/roles.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"

namespace plumb::app {

struct Credentials {
  std::optional<std::string> login;          ///< --user; else the session's user
  std::optional<std::string> session_token;  ///< from the session file, when there is one
  /// Asks for the password of `login` (a file, standard input or the terminal without echo); nullopt when the
  /// front end has no way to ask. Called at most once per command.
  std::function<std::optional<std::string>(const std::string& login)> password;
};

struct Authenticated {
  store::Actor actor;  ///< the printed name, OS account and user id every record of the command carries
  std::string login;
  Roles roles;
  bool password_entered = false;  ///< the password was given for this very command (what a signature needs)
};

/// Authenticates the user for `command` ("check record") and checks the table of permissions. AccessError, in one
/// sentence, for a wrong user or password (a failed attempt is recorded, and the account locked at the lab's
/// limit), a locked or deactivated account, an expired session, a password that must be changed first, a
/// missing role, or a signing command without the password.
Authenticated authenticate(store::Database& db, const std::string& command, const Credentials& credentials);

/// `plumb login`: checks the password and opens a session; returns its token (only its SHA-256 is stored).
struct OpenedSession {
  std::string token;
  std::string login, full_name;
  int idle_minutes = 0;
};
OpenedSession open_session(store::Database& db, const Credentials& credentials);

/// `plumb logout`: ends the session of `token`; false when it had already ended (or was never opened here).
bool close_session(store::Database& db, const std::string& token);

}  // namespace plumb::app
