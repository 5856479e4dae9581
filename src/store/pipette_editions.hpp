#pragma once
// The edition of ISO 8655 each pipette is checked to (migration 015), and the lab's default for pipettes without one
// of their own (migration 020). A change is a new row; the latest is in force; no row at all means 2002.
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
/// The edition in force: the latest row's, or the lab's default (lab_default_pipette_edition) when there is none.
std::string current_pipette_edition(SQLite::Database& db, const std::string& pipette_id);

/// The lab's default edition (migration 020), for pipettes without one of their own; pipette_id is empty.
std::int64_t add_lab_pipette_edition(Recorder& rec, const PipetteEdition& e);
/// Every row of the lab's default, oldest first.
std::vector<PipetteEdition> lab_pipette_edition_history(SQLite::Database& db);
/// The lab's default in force: the latest row's, or "2002" when there is none.
std::string lab_default_pipette_edition(SQLite::Database& db);

}  // namespace plumb::store
