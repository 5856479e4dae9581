#pragma once
// An instrument's attributes over time (schema/006_lifecycle.sql): its identity (maker, model, serial number,
// asset tag), where it stands, how often it is checked and, for a balance, the policy of its weekly check.
// Registration holds the first set; each change appends a whole new set with the date it holds from, who
// changed it and why. Nothing is edited: the set in force on a date is the latest dated on or before it.
#include <SQLiteCpp/Database.h>

#include <optional>
#include <string>
#include <vector>

#include "checks/verdict.hpp"
#include "core/dates.hpp"
#include "core/units.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::store {

/// A date after every change: binding it to version_join reads the attributes in force now.
inline constexpr const char* latest_attributes_date = "9999-12-31";

/// A balance's weekly-check policy as an attribute that can change.
struct BalancePolicy {
  TolerancePolicy tolerance;
  std::optional<ExactMass> smallest_net;
  friend bool operator==(const BalancePolicy& a, const BalancePolicy& b) {
    return a.tolerance.kind == b.tolerance.kind && a.tolerance.max_bias == b.tolerance.max_bias &&
           a.tolerance.max_sd == b.tolerance.max_sd && a.tolerance.min_readings == b.tolerance.min_readings &&
           a.smallest_net == b.smallest_net;
  }
};

struct InstrumentAttributes {
  std::int64_t version_id = 0;  ///< 0: as registered
  InstrumentIdentity identity;
  std::string location;
  Interval every;
  std::optional<BalancePolicy> balance_policy;  ///< balances only
  Date effective_on;       ///< from this date on (registration: the date it entered service)
  std::string reason;      ///< why it changed ("registered" for the first set)
  std::string recorded_at, recorded_by;
};

/// The identity given at registration (kept apart because the first schema had no place for it).
void add_instrument_identity(Recorder& rec, const std::string& instrument_id, const InstrumentIdentity& identity);
/// Appends a new set of attributes for an existing instrument.
std::int64_t add_instrument_version(Recorder& rec, const std::string& instrument_id, const InstrumentAttributes& a);

/// Every set of attributes the instrument has had: registration first, then each change in the order they hold
/// (by effective date, then as recorded). Empty when the instrument does not exist.
std::vector<InstrumentAttributes> attribute_history(SQLite::Database& db, const std::string& instrument_id);
/// The set in force on `on` (the registration set when no change is dated on or before it).
std::optional<InstrumentAttributes> attributes_on(SQLite::Database& db, const std::string& instrument_id, Date on);

/// SQL that joins the set in force on the date bound to parameter ?`param` as table alias `alias` (NULL columns
/// when no change is dated on or before it): `LEFT JOIN instrument_versions alias ON alias.id = (...)`. Used by
/// the balance, pipette and status queries so that each reads the attributes in force with one join.
std::string version_join(const std::string& alias, const std::string& instrument_column, int param);

}  // namespace plumb::store
