#pragma once
// Everything the lab knows about one reference weight (`plumb weight show`): its attributes, every
// certificate with the one in force on a date, the class overrides recorded, and whether it is retired.
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "core/dates.hpp"
#include "report/registry/weight_details.hpp"
#include "store/database.hpp"

namespace plumb::app {

/// InputError when `id` is not a registered weight.
report::WeightDetails weight_details(store::Database& db, const std::string& id, Date on);

/// The status on `on` of every weight, by id, as weight_details gives it (`weight list`).
std::map<std::string, std::string> weight_statuses(store::Database& db, Date on);

}  // namespace plumb::app
