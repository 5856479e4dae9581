#pragma once
// The lab itself: the first record of every database, which everything else needs.
#include <filesystem>
#include <string>

#include "store/database.hpp"
#include "store/recorder.hpp"
#include "app/people/accounts.hpp"
#include "store/records.hpp"

namespace plumb::app {

/// Records the lab in an open database. Refuses a second init, and a name that is blank or not plain text.
void init_lab(store::Database& db, const store::Actor& actor, const std::string& name);

/// `plumb init`: checks the name, creates the database at `path` if needed with its first administrator, who
/// records the lab. On a database from before user accounts (a lab, no accounts), adds the first administrator
/// only (`name` may then be empty). When anything is refused, no database file is left behind. Returns whether a
/// new lab was recorded.
bool create_lab(const std::filesystem::path& path, const NewUser& admin, const std::string& name);

/// The lab must exist before anything else is recorded.
store::LabRecord require_lab(store::Database& db);

}  // namespace plumb::app
