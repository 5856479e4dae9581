#pragma once
// `pipette set-edition P --edition 2022`: the edition of ISO 8655 a pipette is checked to (quality manager; history
// kept in pipette_editions, migration 015). A gravimetric run is then held to that edition's requirements
// (checks/pipette_edition) and its certificate names the edition.
#include <string>

#include "checks/pipette_edition.hpp"
#include "store/database.hpp"
#include "store/pipette_editions.hpp"
#include "store/recorder.hpp"

namespace plumb::app {

/// Validates (InputError naming the option) and appends the choice in one transaction.
store::PipetteEdition set_pipette_edition(store::Database& db, const store::Actor& actor, const std::string& pipette_id,
                                          const std::string& edition, const std::string& reason);

/// The edition in force for the pipette.
checks::Iso8655Edition pipette_edition(store::Database& db, const std::string& pipette_id);

}  // namespace plumb::app
