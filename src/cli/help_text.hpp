#pragma once
// The words plumb explains itself with, kept in one place: `plumb --help`, `plumb NOUN VERB --help`, the
// manual page (plumb --print-man) and the shell completion (plumb --print-bash-completion) all read them, so
// that what the binary prints and what is installed beside it cannot drift apart.
#include <cstddef>
#include <string>
#include <vector>

#include "cli/command.hpp"

namespace plumb::cli::help {

/// One line: what plumb is.
extern const char* const tagline;
/// `plumb [--db PATH] NOUN [VERB] [options]`
extern const char* const usage;

struct GlobalOption {
  std::string name;       ///< with its dashes, e.g. "--db"
  std::string parameter;  ///< e.g. "PATH"; empty for a flag
  std::string description;
};
/// The options that come before the noun (the hidden generator options are not among them).
const std::vector<GlobalOption>& global_options();

struct ExitStatus {
  int code;
  std::string meaning;
};
const std::vector<ExitStatus>& exit_statuses();

struct EnvironmentVariable {
  std::string name;
  std::string meaning;
};
const std::vector<EnvironmentVariable>& environment();

/// A few paragraphs for the manual page's DESCRIPTION: what plumb keeps and computes, and its cautions.
const std::vector<std::string>& description();

/// "noun verb", or "noun" for a one-word command.
std::string command_name(const Command& c);

/// The options a command accepts as the dispatcher parses them: `--help` first, then the command's own.
void command_options(const Command& c, po::options_description& d, po::positional_options_description& p);

/// The long names of the positional arguments, in order (an argument repeated without limit appears once).
std::vector<std::string> positional_names(const po::positional_options_description& p);

/// What a positional argument is called in usage lines: an `id` is named by the command's noun ("BALANCE",
/// "WEIGHT", "INSTRUMENT"), any other argument by its own name ("RUN", "FILE").
std::string positional_label(const Command& c, const std::string& option_name);

/// The width of the name column of a two-column listing: the longest name and two spaces, so that no name
/// runs into its description.
std::size_t name_column_width(const std::vector<std::string>& names);

/// Whether an option's value is a path (a file to read or write, a folder): the completion offers files.
bool takes_path(const po::option_description& o);

}  // namespace plumb::cli::help
