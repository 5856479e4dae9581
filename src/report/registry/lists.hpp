#pragma once
// The registry lists (`plumb weight list`, `plumb balance list`) as text, JSON and CSV.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "store/records.hpp"

namespace plumb::report {

std::string weights_text(const std::vector<store::WeightRecord>& weights);
nlohmann::json weights_json(const std::vector<store::WeightRecord>& weights);
std::string weights_csv(const std::vector<store::WeightRecord>& weights);

std::string balances_text(const std::vector<store::BalanceRecord>& balances);
nlohmann::json balances_json(const std::vector<store::BalanceRecord>& balances);
std::string balances_csv(const std::vector<store::BalanceRecord>& balances);

}  // namespace plumb::report
