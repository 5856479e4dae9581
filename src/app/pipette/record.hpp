#pragma once
// Recording a gravimetric pipette check (ISO 8655-6): validate everything (the pipette, the balance used,
// the environment, every weighing line of the CSV), compute volumes, errors and verdicts per test volume
// and channel (checks/pipette.hpp), schedule the next check and write it all in one transaction.
//
// The balance used must be registered and, on the run date, in service (its latest check on or before that
// date passed) and in date (that check's next due date is not before the run date); its repeatability for
// ISO 8655-6 Table 1 is the SD of its latest check on or before the run date that measured one (results
// "sd_g"), counts (neither corrected nor void) and met its own minimum of readings (checks::met_its_minimum).
// An unusable or unsuitable balance refuses the run: exit 2, nothing written.
//
// Weighings CSV: a header row with columns `volume` (the selected volume: 100, 100uL or 0.1mL; a bare
// number is in uL), `channel` (optional, 1-based, default 1), `reading` (the mass exactly as displayed) and
// optionally `unit` (ug, mg, g, kg); readings without a unit take the default unit (`--unit`, g unless told).
#include <optional>
#include <string>
#include <vector>

#include "core/units.hpp"
#include "store/database.hpp"
#include "store/pipettes.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"
#include "store/repository.hpp"

namespace plumb::app {

/// One weighing: its selected volume, channel and the mass exactly as displayed; `line` numbers it in messages.
struct PipetteWeighing {
  int line = 0;
  ExactVolume volume;
  int channel = 1;
  MassReading reading;
};

struct PipetteCheckInput {
  std::string pipette_id;
  std::string balance_id;
  std::string water_temperature;           ///< degC, as typed
  std::string pressure;                    ///< hPa, as typed
  std::string humidity;                    ///< %RH, as typed
  std::optional<std::string> evaporation;  ///< mass lost per weighing, with unit, e.g. "0.01mg"
  /// Standard uncertainties for the budget (checks/pipette_uncertainty.hpp), with units; stated defaults when absent.
  std::optional<std::string> water_temperature_u;  ///< the thermometer's, e.g. "0.1C"
  std::optional<std::string> air_density_u;        ///< e.g. "0.005kg/m3"
  std::string readings_csv;
  std::string readings_source;  ///< file name for messages
  /// Weighings already read (a capture at the bench); readings_csv is then not parsed.
  std::optional<std::vector<PipetteWeighing>> parsed_weighings;
  MassUnit default_unit = MassUnit::g;
  std::string on;  ///< date performed, YYYY-MM-DD
  std::string operator_name;
  std::optional<std::int64_t> supersedes;  ///< a correction: the run this one replaces
  std::string reason;                      ///< why it replaces it (required with supersedes)
};

/// Validates, computes and records one pipette check in its own transaction; nothing is written on error.
store::RunRecord record_pipette_check(store::Database& db, const store::Actor& actor, const PipetteCheckInput& in);
/// The same inside a transaction the caller holds; returns the new run id. `extra` adds rows of its own to the
/// run's group (a capture's raw lines), so the run's one audit record covers them.
std::int64_t record_pipette_check_in(store::Database& db, store::Recorder& rec, const PipetteCheckInput& in,
                                     const store::RunDetails& extra = {});

/// The water temperature as `check record` reads it (with its unit, inside ISO 8655-6's range); InputError names
/// `field`.
Decimal parse_water_temperature(const std::string& text, std::string_view field);

/// One weighing against the balance it was weighed on: its decimals within the readability, positive, within the
/// capacity. InputError with the sentence naming `where` (the file or port and line).
void check_pipette_weighing(const MassReading& reading, const std::string& where, const store::BalanceRecord& balance);

/// Everything of `in` but the water temperature and the weighings, checked as record_pipette_check_in checks it,
/// so that a capture at the bench says a wrong option, pipette or balance before the first weighing.
void check_pipette_setup(store::Database& db, const PipetteCheckInput& in);

/// A pipette run validated and computed but not written: what record_pipette_check_in stores (no id yet), for a
/// preview that must show exactly what recording would.
struct PipetteRunDraft {
  store::RunRecord run;
  store::PipetteRunConditions conditions;
};
/// Every refusal of record_pipette_check_in, and the same results, without writing anything.
PipetteRunDraft build_pipette_run(store::Database& db, const PipetteCheckInput& in);

}  // namespace plumb::app
