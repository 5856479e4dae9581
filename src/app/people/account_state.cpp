#include "app/people/account_state.hpp"

#include <date/date.h>

#include <chrono>
#include <sstream>

#include "core/errors.hpp"

namespace plumb::app {
namespace {

std::chrono::sys_seconds utc_time(const std::string& text) {
  std::istringstream in(text);
  date::sys_seconds t;
  in >> date::parse("%Y-%m-%dT%H:%M:%SZ", t);
  if (in.fail()) throw StorageError("the stored time \"" + text + "\" is not a UTC timestamp.");
  return t;
}

}  // namespace

AccountState account_state(const std::vector<store::AccountEvent>& events) {
  AccountState s;
  for (const auto& e : events) {
    if (e.event == "role granted" || e.event == "role revoked") {
      if (const auto r = role_from_stored(e.role)) {
        if (e.event == "role granted")
          s.roles.insert(*r);
        else
          s.roles.erase(*r);
      }
    } else if (e.event == "deactivated") {
      s.active = false;
    } else if (e.event == "reactivated") {
      s.active = true;
    } else if (e.event == "failed log-in") {
      ++s.failures;
    } else if (e.event == "locked") {
      s.locked = true;
    } else if (e.event == "unlocked") {
      s.locked = false;
      s.failures = 0;
    } else if (e.event == "logged in") {
      s.failures = 0;
    }
  }
  return s;
}

bool password_expired(const std::string& set_at, std::optional<int> max_age_days, const std::string& now) {
  if (!max_age_days) return false;
  return utc_time(now) - utc_time(set_at) >= std::chrono::hours(24) * *max_age_days;
}

bool session_idle(const std::string& last_used, int idle_minutes, const std::string& now) {
  return utc_time(now) - utc_time(last_used) > std::chrono::minutes(idle_minutes);
}

}  // namespace plumb::app
