#pragma once
// The lab itself: the first record of every database, which everything else needs.
#include <filesystem>
#include <string>

#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::app {

/// Records the lab in an open database. Refuses a second init, and a name that is blank or not plain text.
void init_lab(store::Database& db, const store::Actor& actor, const std::string& name);

/// `plumb init`: checks the name, creates the database at `path` if needed and records the lab. When anything
/// is refused, no database file is left behind.
void create_lab(const std::filesystem::path& path, const store::Actor& actor, const std::string& name);

/// The lab must exist before anything else is recorded.
store::LabRecord require_lab(store::Database& db);

}  // namespace plumb::app
