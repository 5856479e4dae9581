#pragma once
// The lab itself: the first record of every database, which everything else needs.
#include <string>

#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::app {

/// Creates the database if needed and records the lab. Refuses a second init.
void init_lab(store::Database& db, const store::Actor& actor, const std::string& name);

/// The lab must exist before anything else is recorded.
store::LabRecord require_lab(store::Database& db);

}  // namespace plumb::app
