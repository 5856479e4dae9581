#pragma once
// How the statistics explain a value in words: four significant digits and the unit, if any.
#include <fmt/format.h>

#include <string>

namespace plumb::stats {

inline std::string value_text(double v, const std::string& unit) {
  return unit.empty() ? fmt::format("{:.4g}", v) : fmt::format("{:.4g} {}", v, unit);
}

}  // namespace plumb::stats
