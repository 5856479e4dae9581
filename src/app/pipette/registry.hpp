#pragma once
// Registering piston pipettes (`plumb pipette add`) and reading the volumes and limits users type.
// Every field is validated here and named in the error when wrong; nothing is written on error.
#include <optional>
#include <string>
#include <string_view>

#include "core/decimal.hpp"
#include "core/units.hpp"
#include "app/registry/instrument_attributes.hpp"
#include "store/database.hpp"
#include "store/pipettes.hpp"
#include "store/recorder.hpp"

namespace plumb::app {

struct PipetteInput {
  std::string id;
  std::string nominal;   ///< "100uL", "1mL", "100" (a bare number is in uL)
  std::string range;     ///< "fixed", or "10uL-100uL" (the upper end must be the nominal volume)
  std::string channels = "1";
  std::string every;     ///< check interval: "3mo", "6mo", "1y"
  std::string location;
  std::optional<std::string> max_systematic;  ///< lab limit: "0.8uL" or "0.8%"
  std::optional<std::string> max_random;      ///< lab limit: "0.3uL" (SD) or "0.3%" (CV)
  std::optional<std::string> since;           ///< in use since (first check due), default today
  IdentityInput identity;
};

store::PipetteRecord add_pipette(store::Database& db, const store::Actor& actor, const PipetteInput& in);

/// A volume as typed: "100uL", "100 uL", "0.1mL"; a bare number only where a documented input says its unit
/// (`bare_number_unit`: the volume column of a weighings file is in uL). Exact, with trailing zeros dropped.
/// Throws InputError naming `field` when it is not a positive volume.
ExactVolume parse_volume(std::string_view text, std::string_view field,
                         std::optional<VolumeUnit> bare_number_unit = std::nullopt);

/// One line describing a pipette's limits, e.g. "ISO 8655-2:2002" or "lab: systematic 1 %, random 0.5 % (CV)".
std::string limits_summary(const pipette_limits::LimitsPolicy& p);

}  // namespace plumb::app
