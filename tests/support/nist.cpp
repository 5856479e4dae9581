#include "support/nist.hpp"

#include <fstream>
#include <regex>
#include <sstream>
#include <stdexcept>

namespace plumb::test {
namespace {

std::vector<std::string> lines_of(const std::filesystem::path& file) {
  std::ifstream in(file);
  if (!in) throw std::runtime_error("cannot open " + file.string());
  std::vector<std::string> lines;
  for (std::string line; std::getline(in, line);) {
    if (!line.empty() && line.back() == '\r') line.pop_back();
    lines.push_back(line);
  }
  return lines;
}

double number_after_colon(const std::string& line) {
  const auto colon = line.rfind(':');
  return std::stod(line.substr(colon + 1));
}

}  // namespace

NistUnivariate read_nist_univariate(const std::filesystem::path& file) {
  const auto lines = lines_of(file);
  NistUnivariate u;
  for (const auto& l : lines) {
    if (l.find("Sample Mean") != std::string::npos) u.certified_mean = number_after_colon(l);
    if (l.find("Sample Standard Deviation") != std::string::npos) u.certified_sd = number_after_colon(l);
  }
  for (std::size_t i = 60; i < lines.size(); ++i) {
    std::istringstream fields(lines[i]);
    for (std::string v; fields >> v;) u.values.push_back(v);
  }
  return u;
}

NistLinear read_nist_linear(const std::filesystem::path& file) {
  NistLinear d;
  static const std::regex certified(R"(#\s*certified\s+(\S+)\s*=\s*(\S+))");
  bool header_seen = false;
  for (const auto& l : lines_of(file)) {
    std::smatch m;
    if (std::regex_search(l, m, certified)) {
      d.certified[m[1]] = std::stod(m[2]);
    } else if (l.empty() || l[0] == '#') {
      continue;
    } else if (!header_seen) {
      header_seen = true;
    } else {
      const auto comma = l.find(',');
      d.x.push_back(std::stod(l.substr(0, comma)));
      d.y.push_back(std::stod(l.substr(comma + 1)));
    }
  }
  return d;
}

}  // namespace plumb::test
