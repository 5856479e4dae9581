#pragma once
// Registering a balance: capacity, readability, check interval and the tolerance policy of its weekly check.
#include <optional>
#include <string>

#include "app/registry/instrument_attributes.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::app {

struct BalanceInput {
  std::string id, capacity, readability, every, location;
  std::optional<std::string> smallest_net, max_bias, max_sd, since;
  IdentityInput identity;
};
store::BalanceRecord add_balance(store::Database& db, const store::Actor& actor, const BalanceInput& in);

}  // namespace plumb::app
