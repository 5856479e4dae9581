#pragma once
// The edition of ISO 8655 each pipette is checked to (migration 015). A change is a new row; the latest is in force;
// no row means 2002.
#include <SQLiteCpp/Database.h>

#include <cstdint>
#include <string>
#include <vector>

#include "store/recorder.hpp"

namespace plumb::store {

struct PipetteEdition {
  std::int64_t id = 0;
  std::string pipette_id;
  std::string edition = "2002";  ///< "2002" | "2022"
  std::string reason;
  std::string created_at, created_by;
};

std::int64_t add_pipette_edition(Recorder& rec, const PipetteEdition& e);
/// Every row of the pipette, oldest first.
std::vector<PipetteEdition> pipette_edition_history(SQLite::Database& db, const std::string& pipette_id);
/// The edition in force: the latest row's, or "2002" when there is none.
std::string current_pipette_edition(SQLite::Database& db, const std::string& pipette_id);

}  // namespace plumb::store
