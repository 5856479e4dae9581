#pragma once
// Setting up a lab: the lab itself, its reference weights and its balances. Inputs arrive as the
// user typed them; every field is validated here and named in the error when wrong.
#include <optional>
#include <string>

#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::app {

/// Creates the database if needed and records the lab. Refuses a second init.
void init_lab(store::Database& db, const store::Actor& actor, const std::string& name);

struct WeightInput {
  std::string id, nominal, weight_class, correction = "0g", uncertainty, k = "2", certificate, calibrated, due;
  std::optional<std::string> density;  ///< kg/m3; conventional 8000 when absent
};
store::WeightRecord add_weight(store::Database& db, const store::Actor& actor, const WeightInput& in);

struct BalanceInput {
  std::string id, capacity, readability, every, location;
  std::optional<std::string> smallest_net, max_bias, max_sd, since;
};
store::BalanceRecord add_balance(store::Database& db, const store::Actor& actor, const BalanceInput& in);

/// The lab must exist before anything else is recorded.
store::LabRecord require_lab(store::Database& db);

/// An identifier: 1-64 characters of letters, digits, '-', '_', '.', not "LAST".
void validate_id(const std::string& id, std::string_view field);

}  // namespace plumb::app
