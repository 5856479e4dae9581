#include "report/format/text.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>

#include <sstream>
#include <utility>

#include "core/decimal.hpp"
#include "core/units.hpp"

namespace plumb::report {

std::string mass_text(const nlohmann::json& grams, int significant) {
  if (!grams.is_number()) return "-";
  return format_mass(Mass::grams(grams.get<double>()), significant);
}

std::vector<std::string> wrap(const std::string& text, std::size_t width, const std::string& first,
                              const std::string& indent) {
  std::vector<std::string> lines;
  std::istringstream words(text);
  std::string line = first, word;
  bool empty = true;
  while (words >> word) {
    if (!empty && line.size() + 1 + word.size() > width) {
      lines.push_back(line);
      line = indent;
      empty = true;
    }
    line += (empty ? "" : " ") + word;
    empty = false;
  }
  if (!empty) lines.push_back(line);
  return lines;
}

std::string rule(char c, std::size_t width) {
  return std::string(width, c);
}

std::string field_text(const nlohmann::json& j, const char* key, const std::string& fallback) {
  if (!j.is_object() || !j.contains(key) || j[key].is_null()) return fallback;
  return j[key].is_string() ? j[key].get<std::string>() : j[key].dump();
}

std::string grams_field(const nlohmann::json& j, const char* key) {
  if (!j.is_object() || !j.contains(key) || j[key].is_null()) return "-";
  if (j[key].is_string()) return ExactMass::grams(Decimal::parse(j[key].get<std::string>())).to_string();
  return mass_text(j[key], 4);
}

namespace {

/// The code point of the UTF-8 sequence at text[i] and its length; length 0 when the bytes are not UTF-8.
std::pair<char32_t, std::size_t> next_code_point(std::string_view text, std::size_t i) {
  const auto byte = [&](std::size_t k) { return static_cast<unsigned char>(text[k]); };
  const unsigned char b = byte(i);
  const std::size_t n = b < 0x80 ? 1 : (b >> 5) == 0x6 ? 2 : (b >> 4) == 0xE ? 3 : (b >> 3) == 0x1E ? 4 : 0;
  if (n == 0 || i + n > text.size()) return {0, 0};
  char32_t cp = n == 1 ? b : b & (0x7F >> n);
  for (std::size_t k = 1; k < n; ++k) {
    if ((byte(i + k) & 0xC0) != 0x80) return {0, 0};
    cp = (cp << 6) | (byte(i + k) & 0x3F);
  }
  return {cp, n};
}

bool breaks_the_line(char32_t cp) {
  return cp < 0x20 || (cp >= 0x7F && cp <= 0x9F) || cp == 0x2028 || cp == 0x2029 || (cp >= 0x202A && cp <= 0x202E) ||
         (cp >= 0x2066 && cp <= 0x2069);
}

}  // namespace

std::string printable(std::string_view text) {
  std::string out;
  out.reserve(text.size());
  for (std::size_t i = 0; i < text.size();) {
    const auto [cp, n] = next_code_point(text, i);
    if (n == 0) {
      out += fmt::format("\\x{:02x}", static_cast<unsigned char>(text[i]));
      ++i;
      continue;
    }
    if (!breaks_the_line(cp)) {
      out.append(text.substr(i, n));
    } else if (cp == '\n') {
      out += "\\n";
    } else if (cp == '\r') {
      out += "\\r";
    } else if (cp == '\t') {
      out += "\\t";
    } else if (cp < 0x100) {
      out += fmt::format("\\x{:02x}", static_cast<unsigned>(cp));
    } else {
      out += fmt::format("\\u{{{:04x}}}", static_cast<unsigned>(cp));
    }
    i += n;
  }
  return out;
}

std::string milligrams_for_d(double grams, const std::string& d_g, int finer, bool with_sign) {
  const int d_decimals_in_mg = d_g.empty() ? 1 : std::max(0, Decimal::parse(d_g).significant_scale() - 3);
  const int decimals = d_decimals_in_mg + finer;
  return with_sign ? fmt::format("{:+.{}f} mg", grams * 1e3, decimals)
                   : fmt::format("{:.{}f} mg", grams * 1e3, decimals);
}

std::string fixed_grams_field(const nlohmann::json& j, const char* key, int decimals) {
  if (!j.is_object() || !j.contains(key) || !j[key].is_number()) return "-";
  return fmt::format("{:.{}f} g", j[key].get<double>(), decimals);
}

}  // namespace plumb::report

namespace plumb::report {

std::string certificate_closing_text(const nlohmann::json& c, const std::string& content_sha256) {
  std::string out = "\nSignatures\n";
  for (const auto& s : c.value("signatories", nlohmann::json::array())) {
    const std::string name = field_text(s, "name", "");
    out += fmt::format("  {:<14} {:<24} signature ____________________  date __________\n", field_text(s, "role") + ":",
                       name.empty() ? "________________________" : name);
  }
  out += "\n";
  for (const auto& l : wrap(field_text(c, "caution"), 78, "Caution: ", "  ")) out += l + "\n";
  out += rule() + "\n";
  out += fmt::format("Certificate content SHA-256: {}\n", content_sha256);
  return out;
}

std::string reasons_and_notes_text(const nlohmann::json& result) {
  std::string out;
  for (const auto& r : result.value("reasons", nlohmann::json::array()))
    for (const auto& l : wrap(r.get<std::string>(), 78, "  - ", "    ")) out += l + "\n";
  for (const auto& n : result.value("notes", nlohmann::json::array()))
    for (const auto& l : wrap(n.get<std::string>(), 78, "  Note: ", "    ")) out += l + "\n";
  return out;
}

std::string upper_case(std::string s) {
  std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return static_cast<char>(std::toupper(c)); });
  return s;
}

double number_field(const nlohmann::json& j, const char* key) {
  return j.contains(key) && j[key].is_number() ? j[key].get<double>() : 0.0;
}

void add_line(std::string& out, const std::string& line) {
  out += line;
  out += '\n';
}

std::string identity_text(const nlohmann::json& instrument) {
  const auto part = [&](const char* key) { return field_text(instrument, key, ""); };
  std::string out = part("maker");
  if (!part("model").empty()) out += (out.empty() ? "" : " ") + part("model");
  if (!part("serial").empty()) out += (out.empty() ? "serial " : ", serial ") + part("serial");
  if (!part("asset_tag").empty()) out += (out.empty() ? "asset tag " : ", asset tag ") + part("asset_tag");
  return out;
}

}  // namespace plumb::report
