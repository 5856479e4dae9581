#pragma once
// What an account's events add up to: its roles, whether it is active or locked, how many log-ins failed since
// the last success; and whether its password has aged out. Pure: events and times in, answers out.
#include <optional>
#include <string>
#include <vector>

#include "app/people/roles.hpp"
#include "store/users.hpp"

namespace plumb::app {

struct AccountState {
  Roles roles;
  bool active = true;
  bool locked = false;
  int failures = 0;  ///< failed log-ins since the last successful one, unlock or password change
};

/// Replays `events` (in order). `password_set_at` resets the failure count from that time on.
AccountState account_state(const std::vector<store::AccountEvent>& events);

/// Whether a password set at `set_at` has passed `max_age_days` on `now` (UTC timestamps, YYYY-MM-DDTHH:MM:SSZ);
/// never without an age limit.
bool password_expired(const std::string& set_at, std::optional<int> max_age_days, const std::string& now);

/// Whether a session last used at `last_used` has been idle longer than `idle_minutes` on `now`.
bool session_idle(const std::string& last_used, int idle_minutes, const std::string& now);

}  // namespace plumb::app
