#pragma once
// The registry lists (`plumb weight list`, `plumb balance list`) as text, JSON and CSV.
#include <map>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "store/records.hpp"

namespace plumb::report {

/// `status`: by weight id, "in date", "overdue", "retired", ... (app::weight_statuses); a weight without one is
/// listed with an empty status.
using WeightStatuses = std::map<std::string, std::string>;
std::string weights_text(const std::vector<store::WeightRecord>& weights, const WeightStatuses& status = {});
nlohmann::json weights_json(const std::vector<store::WeightRecord>& weights, const WeightStatuses& status = {});
std::string weights_csv(const std::vector<store::WeightRecord>& weights, const WeightStatuses& status = {});

/// `status`: by balance id, the standing every output shows (app::standings_on): "in date", "due", "overdue",
/// "out of service", "retired".
using InstrumentStatuses = std::map<std::string, std::string>;
std::string balances_text(const std::vector<store::BalanceRecord>& balances, const InstrumentStatuses& status = {});
nlohmann::json balances_json(const std::vector<store::BalanceRecord>& balances, const InstrumentStatuses& status = {});
std::string balances_csv(const std::vector<store::BalanceRecord>& balances, const InstrumentStatuses& status = {});

}  // namespace plumb::report
