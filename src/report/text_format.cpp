#include "report/text_format.hpp"

#include <sstream>

#include "core/units.hpp"

namespace plumb::report {

std::string mass_text(const nlohmann::json& grams, int significant) {
  if (!grams.is_number()) return "-";
  return format_mass(Mass{grams.get<double>()}, significant);
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

std::string rule(char c, std::size_t width) { return std::string(width, c); }

}  // namespace plumb::report
