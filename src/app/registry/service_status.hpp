#pragma once
// Taking an instrument or a reference weight out of use (retire) and bringing it back (reinstate).
// Both are append-only events with a reason; the item and its history stay in the database.
#include <optional>
#include <string>

#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/status_events.hpp"

namespace plumb::app {

/// Records `event` ("retired" or "reinstated") for the instrument or weight `id` (`item_kind` "instrument"
/// or "weight"), in one transaction. InputError for an unknown item, an empty reason, retiring what is
/// retired or reinstating what is in service.
store::ServiceEvent change_service_status(store::Database& db, const store::Actor& actor, const std::string& item_kind,
                                          const std::string& id, const std::string& event, const std::string& reason);

/// InputError when the item is retired: a retired instrument or weight takes no new checks.
void require_in_service(store::Database& db, const std::string& item_kind, const std::string& id);
/// The same from its retirement already read (none: in service).
void require_in_service(const std::string& item_kind, const std::string& id,
                        const std::optional<store::ServiceEvent>& retired);

}  // namespace plumb::app
