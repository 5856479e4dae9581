#include "cli/manual_page.hpp"

#include <fmt/format.h>
#include <fmt/ostream.h>

#include <algorithm>
#include <cctype>
#include <ostream>
#include <vector>

#include "cli/help_text.hpp"
#include "plumb/version.hpp"

namespace plumb::cli {
namespace {

// The commands whose examples make up EXAMPLES: a first session, in the order a new lab would type them.
constexpr const char* example_commands[] = {"init",         "weight add", "balance add",
                                            "check record", "due",        "certificate issue"};

/// Decodes one UTF-8 sequence starting at text[i] (advancing i); a malformed byte stands for itself.
unsigned decode_utf8(std::string_view text, std::size_t& i) {
  const auto byte = [&](std::size_t k) { return static_cast<unsigned char>(text[k]); };
  const unsigned lead = byte(i);
  const std::size_t extra = lead >= 0xF0 ? 3 : lead >= 0xE0 ? 2 : lead >= 0xC0 ? 1 : 0;
  if (extra == 0 || i + extra >= text.size()) return byte(i++);
  unsigned cp = lead & (0x3Fu >> extra);
  for (std::size_t k = 1; k <= extra; ++k) cp = (cp << 6) | (byte(i + k) & 0x3Fu);
  i += extra + 1;
  return cp;
}

/// Splits on spaces outside double quotes, so that a quoted name stays one word of a command line.
std::vector<std::string> shell_words(std::string_view line) {
  std::vector<std::string> words;
  std::string word;
  bool quoted = false;
  for (char ch : line) {
    if (ch == '"') quoted = !quoted;
    if (ch == ' ' && !quoted) {
      if (!word.empty()) words.push_back(word);
      word.clear();
    } else {
      word += ch;
    }
  }
  if (!word.empty()) words.push_back(word);
  return words;
}

/// Words of a command line grouped so that an option stays on one line with its value ("--on 2026-11-30").
std::vector<std::string> option_groups(const std::vector<std::string>& words) {
  std::vector<std::string> groups;
  for (std::size_t i = 0; i < words.size(); ++i) {
    if (words[i].rfind("--", 0) == 0 && i + 1 < words.size() && words[i + 1].rfind('-', 0) != 0) {
      groups.push_back(words[i] + " " + words[i + 1]);
      ++i;
    } else {
      groups.push_back(words[i]);
    }
  }
  return groups;
}

/// Example command lines as a shell would take them, broken with a trailing backslash so that they fit an
/// 80-column terminal inside the manual's two indents (7 + 7 columns).
std::vector<std::string> example_lines(const std::string& example) {
  constexpr std::size_t width = 64;
  const std::string continuation = "    ";
  std::vector<std::string> lines;
  std::size_t start = 0;
  while (start <= example.size()) {
    const std::size_t end = std::min(example.find('\n', start), example.size());
    std::string_view line(example.data() + start, end - start);
    while (!line.empty() && line.front() == ' ') line.remove_prefix(1);
    if (line.size() <= width) {
      if (!line.empty()) lines.emplace_back(line);
    } else {
      std::string current;
      for (const auto& group : option_groups(shell_words(line))) {
        if (!current.empty() && current != continuation && current.size() + 1 + group.size() > width - 2) {
          lines.push_back(current + " \\");
          current = continuation;
        }
        current += (current.empty() || current == continuation) ? group : " " + group;
      }
      lines.push_back(current);
    }
    start = end + 1;
  }
  return lines;
}

/// A help text as the start of a sentence in the manual: its first letter capitalised.
std::string sentence(std::string text) {
  if (!text.empty()) text[0] = static_cast<char>(std::toupper(static_cast<unsigned char>(text[0])));
  return text;
}

class Roff {
 public:
  explicit Roff(std::ostream& out) : out_(out) {}
  void macro(std::string_view name, std::string_view args = {}) {
    out_ << '.' << name;
    if (!args.empty()) out_ << ' ' << args;
    out_ << '\n';
  }
  /// A text line (already escaped, possibly with font escapes).
  void raw(std::string_view line) { out_ << line << '\n'; }
  void text(std::string_view line) { out_ << roff_escape(line) << '\n'; }
  void paragraph(std::string_view line) {
    macro("PP");
    text(line);
  }
  void literal_block(const std::vector<std::string>& lines) {
    macro("RS");
    macro("nf");
    for (const auto& l : lines) text(l);
    macro("fi");
    macro("RE");
  }

 private:
  std::ostream& out_;
};

std::string bold(std::string_view s) {
  return "\\fB" + roff_escape(s) + "\\fR";
}
std::string italic(std::string_view s) {
  return "\\fI" + roff_escape(s) + "\\fR";
}

void write_command(Roff& roff, const Command& c) {
  po::options_description d("options");
  po::positional_options_description p;
  help::command_options(c, d, p);
  const auto positional = help::positional_names(p);

  roff.macro("SS", "\"" + roff_escape("plumb " + help::command_name(c)) + "\"");
  std::string synopsis = bold("plumb") + " " + roff_escape(help::command_name(c));
  for (const auto& name : positional) {
    const auto* o = d.find_nothrow(name, false);
    const bool required = o && o->semantic()->is_required();
    synopsis +=
        " " + std::string(required ? "" : "[") + italic(help::positional_label(c, name)) + (required ? "" : "]");
  }
  synopsis += " [" + italic("options") + "]";
  roff.raw(synopsis);
  roff.macro("br");
  roff.text(sentence(c.summary) + ".");
  for (const auto& o : d.options()) {
    if (o->long_name() == "help") continue;  // every command has it; OPTIONS says so once
    roff.macro("TP");
    std::string term = bold("--" + o->long_name());
    if (const auto param = o->format_parameter(); !param.empty()) term += " " + italic(param);
    roff.raw(term);
    const bool is_positional = std::find(positional.begin(), positional.end(), o->long_name()) != positional.end();
    roff.text(o->description() + (is_positional && o->description().find("positional") == std::string::npos
                                      ? " (may be given without --" + o->long_name() + ")"
                                      : ""));
  }
  roff.macro("PP");
  roff.text("Example:");
  roff.literal_block(example_lines(c.example));
}

}  // namespace

std::string roff_escape(std::string_view text) {
  std::string out;
  if (!text.empty() && (text.front() == '.' || text.front() == '\'')) out += "\\&";
  for (std::size_t i = 0; i < text.size();) {
    const char ch = text[i];
    if (static_cast<unsigned char>(ch) >= 0x80) {
      out += fmt::format("\\[u{:04X}]", decode_utf8(text, i));
      continue;
    }
    if (ch == '\\')
      out += "\\e";
    else if (ch == '-')
      out += "\\-";
    else
      out += ch;
    ++i;
  }
  return out;
}

void write_manual_page(std::ostream& out) {
  Roff roff(out);
  roff.raw(".\\\" plumb(1), generated by `plumb --print-man` from the command table; do not edit.");
  roff.macro("TH", fmt::format("PLUMB 1 \"\" \"plumb {}\" \"User Commands\"", plumb::version));
  // Ragged right without hyphenation: option names, paths and ids must read as typed.
  roff.macro("ad", "l");
  roff.macro("nh");
  roff.macro("SH", "NAME");
  roff.text(std::string("plumb - ") + help::tagline);

  roff.macro("SH", "SYNOPSIS");
  roff.raw(bold("plumb") + " [" + bold("--db") + " " + italic("PATH") + "] " + italic("NOUN") + " [" + italic("VERB") +
           "] [" + italic("options") + "]");
  roff.macro("br");
  roff.raw(bold("plumb") + " " + italic("NOUN") + " [" + italic("VERB") + "] " + bold("--help"));
  roff.macro("br");
  roff.raw(bold("plumb") + " " + bold("--help") + " | " + bold("--version"));

  roff.macro("SH", "DESCRIPTION");
  bool first = true;
  for (const auto& para : help::description()) {
    if (!first) roff.macro("PP");
    roff.text(para);
    first = false;
  }

  roff.macro("SH", "OPTIONS");
  roff.text("Global options come before the noun:");
  for (const auto& g : help::global_options()) {
    roff.macro("TP");
    roff.raw(bold(g.name) + (g.parameter.empty() ? "" : " " + italic(g.parameter)));
    roff.text(sentence(g.description) + ".");
  }
  roff.paragraph("Every command also takes --help, which explains it and its options.");

  roff.macro("SH", "COMMANDS");
  for (const auto& c : commands()) write_command(roff, c);

  roff.macro("SH", "ENVIRONMENT");
  for (const auto& e : help::environment()) {
    roff.macro("TP");
    roff.raw(bold(e.name));
    roff.text(sentence(e.meaning) + ".");
  }

  roff.macro("SH", "FILES");
  roff.macro("TP");
  roff.raw(italic("$XDG_DATA_HOME/plumb/plumb.db"));
  roff.text("The default database, with its -wal and -shm files beside it while in use.");
  roff.macro("TP");
  roff.raw(italic("./plumb-demo.db"));
  roff.text("What plumb demo writes without --db, with the demo's certificate (PDF) and HTML report beside it.");
  roff.macro("TP");
  roff.raw(italic("share/doc/plumb/examples/"));
  roff.text(
      "Under the installation prefix (/usr for the Debian package): the demo laboratory, a calibration "
      "run file and the default certificate layout (layout.json) to adapt. The database schema and the "
      "default layout are compiled into plumb; it needs no other file to run.");

  roff.macro("SH", "EXIT STATUS");
  for (const auto& s : help::exit_statuses()) {
    roff.macro("TP");
    roff.raw(bold(std::to_string(s.code)));
    roff.text(sentence(s.meaning) + ".");
  }

  roff.macro("SH", "EXAMPLES");
  for (const char* name : example_commands)
    for (const auto& c : commands())
      if (help::command_name(c) == name) {
        roff.paragraph(sentence(c.summary) + ":");
        roff.literal_block(example_lines(c.example));
      }
}

}  // namespace plumb::cli
