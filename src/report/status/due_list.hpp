#pragma once
// The due list (`plumb due`) as text, CSV and JSON.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "report/status/views.hpp"

namespace plumb::report {

std::string due_text(const std::vector<DueItem>& items, Date on, int within_days);
std::string due_csv(const std::vector<DueItem>& items);
nlohmann::json due_json(const std::vector<DueItem>& items, Date on, int within_days);

}  // namespace plumb::report
