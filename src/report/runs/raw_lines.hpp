#pragma once
// A captured run's original record in `check show`: every line received or typed, when it arrived and what
// became of it.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "store/raw_lines.hpp"

namespace plumb::report {

nlohmann::json raw_lines_json(const std::vector<store::RawLine>& lines);
/// A block to follow the run's text; empty when the run was not captured.
std::string raw_lines_text(const std::vector<store::RawLine>& lines);

}  // namespace plumb::report
