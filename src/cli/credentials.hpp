#pragma once
// How a person's credentials reach plumb without ever being on its command line (doc/people.md): --user ID names
// the account; the password comes from --password-file FILE (a file only its owner can read), the first line of
// standard input with --password-stdin, or the terminal without echo. A session opened by `plumb login` is a
// token in a file of mode 0600 under $XDG_STATE_HOME/plumb/sessions/ (default ~/.local/state/plumb/sessions/),
// one per database.
#include <filesystem>
#include <optional>
#include <string>

namespace plumb::cli {

struct PasswordSource {
  std::optional<std::filesystem::path> file;  ///< --password-file
  bool standard_input = false;                ///< --password-stdin
};

/// The password from `source`, else from the terminal (prompting on it for `login`, without echo), else nullopt.
/// InputError for a password file others can read, or that is not a regular file owned by this user.
std::optional<std::string> read_password(const PasswordSource& source, const std::string& prompt);

/// The session file of the database at `db`.
std::filesystem::path session_file(const std::filesystem::path& db);
/// The token in the session file of `db`, when there is one.
std::optional<std::string> read_session_token(const std::filesystem::path& db);
/// Writes the token (mode 0600, in folders of mode 0700), replacing an earlier one.
void write_session_token(const std::filesystem::path& db, const std::string& token);
void remove_session_token(const std::filesystem::path& db);

}  // namespace plumb::cli
