#include "report/format/text.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>

#include <sstream>

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

}  // namespace plumb::report
