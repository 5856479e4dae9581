#include "core/balance_line.hpp"

#include <fmt/format.h>

#include "core/errors.hpp"
#include "core/line_splitter.hpp"

namespace plumb {
namespace {

// A sign, then any spaces (some balances pad between the sign and the digits), then the digits.
constexpr std::string_view value_regex = R"(([+-]?)[ \t]*([0-9]+(?:\.[0-9]+)?))";
// Letters, or the micro sign (UTF-8 C2 B5) and letters.
constexpr std::string_view unit_regex = "((?:\xC2\xB5)?[A-Za-z]+)";

/// `c` as a regex that matches it alone: letters and digits as they are, anything else in brackets.
std::string literal_regex(char c) {
  const auto u = static_cast<unsigned char>(c);
  if ((c >= '0' && c <= '9') || (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') || u >= 0x80) return {c};
  if (c == ']' || c == '\\' || c == '^' || c == '-') return fmt::format("[\\{}]", c);
  return fmt::format("[{}]", c);
}

std::string literal_regex(std::string_view text) {
  std::string out;
  for (const char c : text) out += literal_regex(c);
  return out;
}

std::string_view trimmed(std::string_view s) {
  while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
  while (!s.empty() && (s.back() == ' ' || s.back() == '\t' || s.back() == '\r' || s.back() == '\n'))
    s.remove_suffix(1);
  return s;
}

/// "0100.0012" -> "100.0012", "-0.0012" stays: leading zeros pad a field, they are not displayed digits.
std::string displayed_digits(std::string_view sign, std::string_view digits) {
  while (digits.size() > 1 && digits[0] == '0' && digits[1] != '.') digits.remove_prefix(1);
  std::string out(sign == "-" ? "-" : "");
  out += digits;
  return out;
}

}  // namespace

LinePattern LinePattern::parse(std::string_view pattern, std::string_view field) {
  const auto refuse = [&](std::string_view why) {
    throw InputError(fmt::format("{} \"{}\" {}.", field, escaped_line(pattern), why));
  };
  if (pattern.size() > 100) refuse("is longer than 100 characters");
  LinePattern p;
  p.text_ = std::string(pattern);
  std::string re;
  int group = 0;
  bool last_was_space = false;
  for (std::size_t i = 0; i < pattern.size(); ++i) {
    const char c = pattern[i];
    if (static_cast<unsigned char>(c) < 0x20 || c == 0x7f) refuse("contains a control character");
    if (c == ' ') {
      if (!last_was_space) re += "[ \\t]*";
      last_was_space = true;
      continue;
    }
    last_was_space = false;
    if (c == '\\') {
      if (i + 1 == pattern.size()) refuse("ends with a \\ that escapes nothing");
      re += literal_regex(pattern[++i]);
    } else if (c == '*') {
      re += ".*?";
    } else if (c == '{') {
      const std::size_t close = pattern.find('}', i);
      if (close == std::string_view::npos) refuse("has a { without its }");
      const std::string_view name = pattern.substr(i + 1, close - i - 1);
      i = close;
      if (name == "value") {
        if (p.value_group_ != 0) refuse("has {value} twice");
        p.value_group_ = group + 1;
        group += 2;
        re += value_regex;
      } else if (name == "unit") {
        if (p.unit_group_ != 0) refuse("has {unit} twice");
        p.unit_group_ = ++group;
        re += unit_regex;
      } else if (name.substr(0, 5) == "mark:") {
        if (p.mark_group_ != 0) refuse("has {mark:...} twice");
        const std::string_view marks = name.substr(5);
        const std::size_t bar = marks.find('|');
        if (bar == std::string_view::npos || marks.find('|', bar + 1) != std::string_view::npos)
          refuse("has a {mark:...} that is not {mark:STABLE|UNSTABLE}");
        const std::string_view stable = marks.substr(0, bar), unstable = marks.substr(bar + 1);
        if (stable == unstable) refuse("has a {mark:...} whose stable and unstable marks are the same");
        p.mark_group_ = ++group;
        p.stable_mark_ = std::string(stable);
        re += "(" + literal_regex(stable) + "|" + literal_regex(unstable) + ")";
      } else {
        refuse(fmt::format("has {{{}}}, which is not {{value}}, {{unit}} or {{mark:STABLE|UNSTABLE}}", name));
      }
    } else {
      re += literal_regex(c);
    }
  }
  if (p.value_group_ == 0) refuse("has no {value}");
  if (p.unit_group_ == 0) refuse("has no {unit}");
  p.regex_ = std::regex(re, std::regex::ECMAScript | std::regex::optimize);
  return p;
}

std::optional<BalanceLineReading> LinePattern::match(std::string_view line) const {
  if (line.size() >= longest_balance_line) return std::nullopt;  // as received: padding counts
  line = trimmed(line);
  std::match_results<std::string_view::const_iterator> m;
  if (!std::regex_match(line.begin(), line.end(), m, regex_)) return std::nullopt;
  const auto group = [&](int g) { return std::string_view(&*m[g].first, static_cast<std::size_t>(m[g].length())); };
  const auto text_of = [&](int g) { return m[g].length() == 0 ? std::string_view() : group(g); };
  BalanceLineReading r;
  r.text = displayed_digits(text_of(value_group_), text_of(value_group_ + 1));
  try {
    r.value = Decimal::parse(r.text, "reading");
  } catch (const InputError&) {
    return std::nullopt;  // more digits than a reading holds exactly: not a reading
  }
  r.unit_text = std::string(text_of(unit_group_));
  try {
    r.unit = parse_mass_unit(r.unit_text);
  } catch (const InputError&) {
    r.unit = std::nullopt;
  }
  if (mark_group_ != 0) r.stable = text_of(mark_group_) == stable_mark_;
  return r;
}

const std::vector<LinePattern>& common_line_shapes() {
  // Tried in order; the first that matches the whole line reads it. A space also matches no space, so
  // "100.0012g" and "+  100.0012 g" are both the first shape.
  static const std::vector<LinePattern> shapes = [] {
    std::vector<LinePattern> v;
    for (const char* p : {"{value} {unit} {mark:|?}", "{mark:|?} {value} {unit}", "{mark:S|U} {value} {unit}",
                          "{mark:ST|US} , {value} {unit}", "{mark:ST|US} {value} {unit}", "{mark:S|D} {value} {unit}"})
      v.push_back(LinePattern::parse(p, "built-in shape"));
    return v;
  }();
  return shapes;
}

std::optional<BalanceLineReading> read_balance_line(std::string_view line, const LinePattern* pattern) {
  if (pattern) return pattern->match(line);
  for (const auto& shape : common_line_shapes())
    if (auto r = shape.match(line)) return r;
  return std::nullopt;
}

std::string escaped_line(std::string_view raw) {
  std::string out;
  out.reserve(raw.size());
  for (const char c : raw) {
    const auto u = static_cast<unsigned char>(c);
    if (c == '\\')
      out += "\\\\";
    else if (u >= 0x20 && u < 0x7f)
      out += c;
    else
      out += fmt::format("\\x{:02X}", u);
  }
  return out;
}

}  // namespace plumb
