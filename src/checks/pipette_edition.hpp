#pragma once
// The edition of ISO 8655 a pipette is checked to, and what a gravimetric run must meet under it. ISO 8655-2/-6:2002
// are what plumb's limits table and method follow (metrology/pipette_limits, checks/pipette); the 2022 editions
// are a per-pipette choice with these requirements, as recalled from memory of the 2022 texts (not checked against
// the published text here; doc/standards-tables.md):
//   - 10 replicate weighings at every test volume and channel;
//   - the test volumes of ISO 8655-6: the nominal volume, and for a variable pipette also 50 % of it and 10 % of it
//     or the lower limit of the range, whichever is greater;
//   - limits entered by the lab (plumb does not hold the 2022 edition's tables, so the 2002 Table 1 cannot stand
//     for them);
//   - the uncertainty of the measured volume reported with each result (plumb's ISO 8655-6 budget, k = 2).
// A run that does not meet them is refused, naming the first requirement it misses.
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "checks/pipette.hpp"

namespace plumb::checks {

enum class Iso8655Edition { e2002, e2022 };
std::string_view key(Iso8655Edition e);  ///< "2002" | "2022"
/// Throws InputError naming `field` for anything but 2002 or 2022.
Iso8655Edition parse_iso8655_edition(std::string_view text, std::string_view field = "--edition");

/// Replicates a test volume needs under the edition (2002: plumb's minimum, min_replicates).
std::size_t required_replicates(Iso8655Edition e);

/// The sentence the certificate prints: the edition's parts and where the limits come from.
std::string edition_statement(Iso8655Edition e, const PipetteDefinition& pipette);

/// What one test volume of a run held: its volume and the replicate count of each channel.
struct EditionVolume {
  ExactVolume volume;
  std::vector<std::pair<int, std::size_t>> replicates;  ///< channel and its replicate count
};

/// The requirements of the edition the run misses, each one sentence; empty when it conforms.
std::vector<std::string> edition_shortfalls(Iso8655Edition e, const PipetteDefinition& pipette,
                                            const std::vector<EditionVolume>& volumes);

}  // namespace plumb::checks
