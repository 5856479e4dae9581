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

  /// Opens the existing database (InputError if it does not exist).
  [[nodiscard]] store::Database open() const { return store::Database(db_path, store::Database::Open::existing); }
  /// The person recorded as doing this: --by when given, else the OS account.
  [[nodiscard]] static store::Actor actor(const po::variables_map& vm);
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
void add_by_option(po::options_description& d, const std::string& what = "the person doing this");
/// Reads --format and checks it is one of `allowed`.
std::string format_of(const po::variables_map& vm, const std::vector<std::string>& allowed);
std::optional<std::string> optional_string(const po::variables_map& vm, const char* name);

/// Runs plumb with argv; returns the exit status (0 ok, 1 a gated check failed, 2 bad input, 3 internal).
int run(int argc, const char* const* argv, std::ostream& out, std::ostream& err);

}  // namespace plumb::cli
