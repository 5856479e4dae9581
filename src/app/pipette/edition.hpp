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

/// `pipette default-edition --edition 2022`: the lab's default edition, for every pipette without an edition of
/// its own (quality manager; history kept in lab_pipette_editions, migration 020). Refused while a pipette that would
/// follow it is judged by the 2002 table (it could then record no run), naming the first such pipette.
store::PipetteEdition set_lab_pipette_edition(store::Database& db, const store::Actor& actor,
                                              const std::string& edition, const std::string& reason);

/// The edition in force for the pipette: its own choice, else the lab's default, else 2002.
checks::Iso8655Edition pipette_edition(store::Database& db, const std::string& pipette_id);

}  // namespace plumb::app
