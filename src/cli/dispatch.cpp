#include <SQLiteCpp/Exception.h>
#include <fmt/format.h>
#include <fmt/ostream.h>
#include <unistd.h>

#include <algorithm>
#include <iostream>

#include "cli/bash_completion.hpp"
#include "cli/command.hpp"
#include "cli/help_text.hpp"
#include "cli/manual_page.hpp"
#include "core/errors.hpp"
#include "core/text_field.hpp"
#include "plumb/version.hpp"
#include "store/file_access.hpp"

namespace plumb::cli {
namespace {

void print_usage(std::ostream& out) {
  std::vector<std::string> globals, names;
  for (const auto& g : help::global_options())
    globals.push_back(g.parameter.empty() ? g.name : g.name + " " + g.parameter);
  for (const auto& c : commands()) names.push_back(help::command_name(c));
  std::vector<std::string> all = globals;
  all.insert(all.end(), names.begin(), names.end());
  // One column for both lists, as wide as the longest name, so that every description starts in it.
  const std::size_t width = help::name_column_width(all);
  out << "plumb: " << help::tagline << "\n\nusage: " << help::usage << "\n\nglobal options:\n";
  for (std::size_t i = 0; i < globals.size(); ++i)
    out << fmt::format("  {:<{}}{}\n", globals[i], width, help::global_options()[i].description);
  out << "\ncommands:\n";
  for (std::size_t i = 0; i < names.size(); ++i)
    out << fmt::format("  {:<{}}{}\n", names[i], width, commands()[i].summary);
  std::vector<std::string> statuses;
  for (const auto& s : help::exit_statuses()) statuses.push_back(fmt::format("{} {}", s.code, s.meaning));
  out << fmt::format("\nexit status: {}\n", fmt::join(statuses, ", "));
}

/// "LAST" from Boost's "arg (=LAST)"; empty without a default.
std::string default_value_text(const po::option_description& o) {
  const std::string parameter = o.format_parameter();
  const auto at = parameter.find("(=");
  return at == std::string::npos ? "" : parameter.substr(at + 2, parameter.size() - at - 3);
}

/// `plumb balance add BALANCE [options]`, the positional arguments by what they are (not "--id arg"), then the
/// options without them.
void print_command_help(const Command& c, const po::options_description& d, const po::positional_options_description& p,
                        std::ostream& out) {
  const auto positional = help::positional_names(p);
  std::string usage = "plumb " + help::command_name(c);
  std::vector<std::string> labels;
  for (const auto& name : positional) {
    const auto* o = d.find_nothrow(name, false);
    const bool required = o && o->semantic()->is_required();
    labels.push_back(help::positional_label(c, name));
    usage += " " + std::string(required ? "" : "[") + labels.back() + (required ? "" : "]");
  }
  usage += " [options]";
  po::options_description named("options");
  for (const auto& o : d.options())
    if (std::find(positional.begin(), positional.end(), o->long_name()) == positional.end()) named.add(o);
  out << fmt::format("plumb {}: {}\n\nusage: {}\n", help::command_name(c), c.summary, usage);
  if (!positional.empty()) {
    out << "\narguments:\n";
    const std::size_t width = std::max<std::size_t>(help::name_column_width(labels), 22);
    for (std::size_t i = 0; i < positional.size(); ++i) {
      const auto* o = d.find_nothrow(positional[i], false);
      std::string what = o ? o->description() : "";
      if (const auto cut = what.find(" (positional)"); cut != std::string::npos) what.erase(cut, 13);
      const std::string value = o ? default_value_text(*o) : "";
      out << fmt::format("  {:<{}}{}{} (or --{})\n", labels[i], width, what, value.empty() ? "" : ", default " + value,
                         positional[i]);
    }
  }
  out << fmt::format("\n{}\nexample:\n  {}\n", fmt::streamed(named), c.example);
}

std::string describe(const po::error& e) {
  std::string what = e.what();
  if (!what.empty()) what[0] = static_cast<char>(std::toupper(static_cast<unsigned char>(what[0])));
  if (!what.empty() && what.back() != '.') what += '.';
  return what;
}

/// Every text a command was given is checked here, before any command runs, so that no option can miss the
/// check: a name, a reason, an id or a path with a control character or bytes that are not UTF-8 is refused,
/// naming the option. (The app checks its free-text fields again, for callers other than this one.)
void check_option_texts(const po::variables_map& vm, const po::positional_options_description& positional) {
  const auto field_name = [&](const std::string& name) {
    for (unsigned k = 0; k < positional.max_total_count() && k < 8; ++k)
      if (positional.name_for_position(k) == name) return name;
    return "--" + name;
  };
  for (const auto& [name, value] : vm) {
    if (const auto* text = boost::any_cast<std::string>(&value.value())) {
      check_text_field(*text, field_name(name));
    } else if (const auto* texts = boost::any_cast<std::vector<std::string>>(&value.value())) {
      for (const auto& t : *texts) check_text_field(t, field_name(name));
    }
  }
}

/// A message on one line, whatever text it quotes (a value read from a file, an older database, argv).
std::string one_line(const char* message) {
  return shown_on_one_line(message);
}

}  // namespace

app::Credentials Env::credentials() const {
  app::Credentials c;
  c.login = user;
  c.session_token = read_session_token(db_path);
  const PasswordSource source = password;
  c.password = [source](const std::string& login) {
    return read_password(source, fmt::format("plumb: password of {}: ", login));
  };
  return c;
}

app::Authenticated Env::authenticated(store::Database& db) const {
  return app::authenticate(db, command, credentials());
}

void add_format_option(po::options_description& d, const std::string& choices) {
  d.add_options()("format", po::value<std::string>()->default_value("text"), ("output format: " + choices).c_str());
}

std::string format_of(const po::variables_map& vm, const std::vector<std::string>& allowed) {
  std::string f = vm["format"].as<std::string>();
  if (std::find(allowed.begin(), allowed.end(), f) == allowed.end())
    throw InputError(fmt::format("--format \"{}\" is not one of: {}.", f, fmt::join(allowed, ", ")));
  return f;
}

std::optional<std::string> optional_string(const po::variables_map& vm, const char* name) {
  if (!vm.count(name)) return std::nullopt;
  return vm[name].as<std::string>();
}

int run(int argc, const char* const* argv, std::ostream& out, std::ostream& err) {
  std::vector<std::string> args(argv + 1, argv + argc);
  Env env{store::default_database_path(), false, out, err, isatty(STDOUT_FILENO) != 0,
          isatty(STDERR_FILENO) != 0,     {},    {},  {}};
  std::size_t i = 0;
  try {
    store::apply_lab_file_access();
    for (; i < args.size() && args[i].rfind("--", 0) == 0; ++i) {
      if (args[i] == "--help") {
        print_usage(out);
        return 0;
      }
      if (args[i] == "--version") {
        out << "plumb " << plumb::version << "\n";
        return 0;
      }
      // Hidden (DEVELOPERS.md): the build writes the manual page and the completion from the command table.
      if (args[i] == "--print-man") {
        write_manual_page(out);
        return 0;
      }
      if (args[i] == "--print-bash-completion") {
        write_bash_completion(out);
        return 0;
      }
      if (args[i] == "--user" && i + 1 < args.size()) {
        env.user = args[++i];
        check_text_field(*env.user, "--user");
      } else if (args[i] == "--password-file" && i + 1 < args.size()) {
        env.password.file = args[++i];
      } else if (args[i] == "--password-stdin") {
        env.password.standard_input = true;
      } else if (args[i] == "--db" && i + 1 < args.size()) {
        env.db_path = args[++i];
        env.db_given = true;
      } else if (args[i].rfind("--db=", 0) == 0) {
        env.db_path = args[i].substr(5);
        env.db_given = true;
      } else {
        throw InputError(fmt::format("global option \"{}\" is not known (see plumb --help).", args[i]));
      }
    }
    if (i >= args.size()) {
      print_usage(err);
      return 2;
    }
    const std::string noun = args[i++];
    const Command* chosen = nullptr;
    bool noun_known = false;
    for (const auto& c : commands()) {
      if (c.noun != noun) continue;
      noun_known = true;
      if (c.verb.empty()) {
        chosen = &c;
        break;
      }
      if (i < args.size() && c.verb == args[i]) {
        chosen = &c;
        ++i;
        break;
      }
    }
    if (!chosen) {
      if (!noun_known) throw InputError(fmt::format("command \"{}\" is not known (see plumb --help).", noun));
      std::vector<std::string> verbs;
      for (const auto& c : commands())
        if (c.noun == noun) verbs.push_back(c.verb);
      throw InputError(
          fmt::format("\"{}\" needs one of: {} (after it, --help explains).", noun, fmt::join(verbs, ", ")));
    }
    po::options_description desc("options");
    po::positional_options_description positional;
    help::command_options(*chosen, desc, positional);
    if (env.password.file && env.password.standard_input)
      throw InputError("--password-file and --password-stdin are two ways to give the password; give one.");
    env.command = chosen->verb.empty() ? chosen->noun : chosen->noun + " " + chosen->verb;
    const std::vector<std::string> rest(args.begin() + static_cast<std::ptrdiff_t>(i), args.end());
    // Identity comes from authentication, never from a name typed on the command line.
    if (env.command != "audit log")
      for (const auto& a : rest)
        if (a == "--by" || a.rfind("--by=", 0) == 0)
          throw InputError(
              "--by is gone: plumb records the logged-in user; log in with `plumb login --user ID` "
              "(or give --user ID with --password-file FILE or --password-stdin).");
    po::variables_map vm;
    po::store(po::command_line_parser(rest).options(desc).positional(positional).run(), vm);
    if (vm.count("help")) {
      print_command_help(*chosen, desc, positional, out);
      return 0;
    }
    po::notify(vm);
    check_option_texts(vm, positional);
    return chosen->run(vm, env);
  } catch (const InputError& e) {
    err << "plumb: " << one_line(e.what()) << "\n";
    return 2;
  } catch (const po::error& e) {
    err << "plumb: " << one_line(describe(e).c_str()) << "\n";
    return 2;
  } catch (const AccessError& e) {
    err << "plumb: " << one_line(e.what()) << "\n";
    return 4;
  } catch (const StorageError& e) {
    err << "plumb: storage error: " << one_line(e.what()) << "\n";
    return 3;
  } catch (const SQLite::Exception& e) {
    err << "plumb: database error: " << one_line(e.what()) << "\n";
    return 3;
  } catch (const std::exception& e) {
    err << "plumb: internal error: " << one_line(e.what()) << "\n";
    return 3;
  }
}

}  // namespace plumb::cli
