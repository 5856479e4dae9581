#pragma once
// The shape of a plumb command: `plumb [--db PATH] NOUN [VERB] [options]`. Each command declares its
// options (for parsing and --help) and a run function; the dispatcher does the rest.
#include <boost/program_options.hpp>

#include <filesystem>
#include <functional>
#include <iosfwd>
#include <optional>
#include <string>
#include <vector>

#include "app/people/authenticate.hpp"
#include "cli/credentials.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"

namespace plumb::cli {

namespace po = boost::program_options;

struct Env {
  std::filesystem::path db_path;
  bool db_given = false;
  std::ostream& out;
  std::ostream& err;
  bool out_is_terminal = false;
  bool err_is_terminal = false;  ///< progress bars go to stderr only when it is a terminal

  std::string command;                ///< as typed: "check record"
  std::optional<std::string> user;    ///< --user
  PasswordSource password;            ///< --password-file / --password-stdin

  /// Opens the existing database (InputError if it does not exist).
  [[nodiscard]] store::Database open() const { return store::Database(db_path, store::Database::Open::existing); }
  /// The authenticated user this command writes as, allowed to run it by the table of permissions (AccessError
  /// otherwise); a signing command has had the password entered for it.
  [[nodiscard]] app::Authenticated authenticated(store::Database& db) const;
  [[nodiscard]] store::Actor actor(store::Database& db) const { return authenticated(db).actor; }
  /// What authenticate() needs: --user, the session of this database, and a way to ask for the password.
  [[nodiscard]] app::Credentials credentials() const;
};

struct Command {
  std::string noun;
  std::string verb;  ///< empty for one-word commands (init, due, demo)
  std::string summary;
  std::string example;
  std::function<void(po::options_description&, po::positional_options_description&)> options;
  std::function<int(const po::variables_map&, Env&)> run;
};

/// Every command plumb knows, in the order --help lists them.
const std::vector<Command>& commands();

/// Options several commands share.
void add_format_option(po::options_description& d, const std::string& choices = "text|json");
/// Reads --format and checks it is one of `allowed`.
std::string format_of(const po::variables_map& vm, const std::vector<std::string>& allowed);
std::optional<std::string> optional_string(const po::variables_map& vm, const char* name);

/// Runs plumb with argv; returns the exit status (0 ok, 1 a gated check failed, 2 bad input, 3 internal).
int run(int argc, const char* const* argv, std::ostream& out, std::ostream& err);

}  // namespace plumb::cli
