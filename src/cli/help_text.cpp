#include "cli/help_text.hpp"

#include <algorithm>
#include <cctype>

namespace plumb::cli::help {

const char* const tagline = "calibration and verification records for laboratory balances and pipettes";
const char* const usage = "plumb [--db PATH] NOUN [VERB] [options]";

const std::vector<GlobalOption>& global_options() {
  static const std::vector<GlobalOption> all = {
      {"--db", "PATH", "database file (default: $PLUMB_DB, else $XDG_DATA_HOME/plumb/plumb.db)"},
      {"--user", "ID", "the user id to authenticate as (else the session of `plumb login`)"},
      {"--password-file", "FILE", "read the password from FILE's first line (FILE must be mode 0600)"},
      {"--password-stdin", "", "read the password from the first line of standard input"},
      {"--help", "", "this help; `plumb NOUN VERB --help` explains one command"},
      {"--version", "", "print the version"},
  };
  return all;
}

const std::vector<ExitStatus>& exit_statuses() {
  static const std::vector<ExitStatus> all = {
      {0, "ok"},
      {1, "a check failed where --gate was asked or a verification failed"},
      {2, "bad input (nothing written)"},
      {3, "storage or internal error"},
      {4, "not authenticated or not permitted (nothing written but a failed log-in)"},
  };
  return all;
}

const std::vector<EnvironmentVariable>& environment() {
  static const std::vector<EnvironmentVariable> all = {
      {"PLUMB_DB", "the database file when --db is not given"},
      {"XDG_DATA_HOME", "without PLUMB_DB, the database is $XDG_DATA_HOME/plumb/plumb.db"},
      {"HOME", "without XDG_DATA_HOME, the database is $HOME/.local/share/plumb/plumb.db"},
      {"PLUMB_LAYOUT", "the certificate layout file (JSON) when --layout is not given"},
      {"PLUMB_KEY",
       "the lab's Ed25519 signing key (PEM) that signs every command's checkpoint; default: DB.key "
       "beside the database"},
      {"USER", "the operating-system account recorded beside the logged-in user in every audit record"},
  };
  return all;
}

const std::vector<std::string>& description() {
  static const std::vector<std::string> all = {
      "plumb keeps a laboratory's balances, pipettes and reference weights, and the readings of every check made "
      "on them, in one embedded SQLite database, and does the metrology on those readings: accuracy as bias "
      "against the conventional mass of traceable reference weights, repeatability, the USP <41> minimum weight, "
      "EURAMET cg-18 calibration budgets, ISO 8655 gravimetric pipette checks, and a verdict against a stated "
      "tolerance under a stated ILAC G8 decision rule. It issues certificates with due dates, lists what is "
      "overdue, and keeps an append-only audit trail chained by SHA-256. Readings are kept exactly as the "
      "instrument displayed them.",
      "A command is a noun and, for most nouns, a verb. Bad input is refused with one sentence naming the field, "
      "line and value, exit status 2, and nothing written. Every command explains itself with --help.",
      "Selectors: a run is named by its number or LAST, the last run recorded (check show, check correct, "
      "certificate issue). A certificate is named by its number (BC-2026-0001), LAST, the last certificate issued, "
      "or a run number for that run's certificate (certificate show, certificate approve, audit log "
      "--certificate). `plumb certificate list` finds a number; `plumb certificate queue` lists the drafts "
      "waiting for a reviewer.",
      "Every write is made by a logged-in user (plumb login, or --user with --password-file or "
      "--password-stdin; see doc/people.md) and signed into the audit trail. It supports, and does not "
      "replace, accredited calibration, legal-for-trade verification by the competent authority and the "
      "laboratory's own quality procedures. Where results are used for medicine, clinical or food weighing, "
      "follow local regulations and licensed practice, and take an instrument out of use when a check fails.",
  };
  return all;
}

std::string command_name(const Command& c) {
  return c.verb.empty() ? c.noun : c.noun + " " + c.verb;
}

void command_options(const Command& c, po::options_description& d, po::positional_options_description& p) {
  d.add_options()("help", "explain this command");
  c.options(d, p);
}

std::vector<std::string> positional_names(const po::positional_options_description& p) {
  std::vector<std::string> names;
  // An unlimited argument reports a huge count; it has one name, so stop at the first repeat.
  for (unsigned i = 0; i < p.max_total_count(); ++i) {
    const std::string& name = p.name_for_position(i);
    if (!names.empty() && names.back() == name) break;
    names.push_back(name);
  }
  return names;
}

std::string positional_label(const Command& c, const std::string& option_name) {
  std::string label = option_name == "id" ? c.noun : option_name;
  std::transform(label.begin(), label.end(), label.begin(),
                 [](unsigned char ch) { return static_cast<char>(std::toupper(ch)); });
  return label;
}

std::size_t name_column_width(const std::vector<std::string>& names) {
  std::size_t longest = 0;
  for (const auto& n : names) longest = std::max(longest, n.size());
  return longest + 2;
}

bool takes_path(const po::option_description& o) {
  if (o.semantic()->max_tokens() == 0) return false;
  const std::string& description = o.description();
  std::string text = description;
  std::transform(text.begin(), text.end(), text.begin(),
                 [](unsigned char ch) { return static_cast<char>(std::tolower(ch)); });
  // The descriptions say what the value is: a path is called a file, a folder or a layout, or a CSV or JSON
  // (in capitals; "text|csv|json" names formats, not files).
  for (const char* word : {"file", "folder", "directory", "layout"})
    if (text.find(word) != std::string::npos) return true;
  for (const char* word : {"CSV", "JSON"})
    if (description.find(word) != std::string::npos) return true;
  return false;
}

}  // namespace plumb::cli::help
