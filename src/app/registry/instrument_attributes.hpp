#pragma once
// An instrument's attributes as people change them: its identity (maker, model, serial number, asset tag),
// where it stands, how often it is checked and, for a balance, the policy of its weekly check. A change is a
// new version with the date it holds from, who made it and why (store/instrument_versions.hpp); nothing that
// was recorded is edited, and certificates print the version in force on their check date.
#include <optional>
#include <string>

#include "store/database.hpp"
#include "store/instrument_versions.hpp"
#include "store/recorder.hpp"

namespace plumb::app {

/// Identity fields as typed at registration or in a change (absent: unchanged / not given).
struct IdentityInput {
  std::optional<std::string> maker, model, serial, asset_tag;
};
/// The identity given at registration, each field checked as free text and named when wrong.
store::InstrumentIdentity read_identity(const IdentityInput& in);

/// A change of attributes; every absent field keeps its value in force.
struct AttributeChangeInput {
  std::string id;
  IdentityInput identity;
  std::optional<std::string> location, every;
  // Balances only: the weekly-check policy.
  std::optional<std::string> policy;  ///< "usp41" or "lab"
  std::optional<std::string> smallest_net, max_bias, max_sd, min_readings;
  std::optional<std::string> from;  ///< the date the change holds from; default today
  std::string reason;
};

struct AttributeChange {
  store::InstrumentAttributes before, after;
  std::string kind;  ///< "balance" or "pipette"
};

/// Records a new version of the instrument's attributes in one transaction. InputError for an unknown
/// instrument, a missing reason, a change that changes nothing, balance fields on a pipette, a policy without
/// what it needs, or a date in the future, before registration, before the last change or on or before the
/// instrument's last check (whose certificate states the attributes in force then).
AttributeChange change_attributes(store::Database& db, const store::Actor& actor, const AttributeChangeInput& in);

/// "location Room 2 -> Room 5; interval 7d -> 14d": what differs between two versions, for lists and the trail.
std::string describe_change(const store::InstrumentAttributes& before, const store::InstrumentAttributes& after);

}  // namespace plumb::app
