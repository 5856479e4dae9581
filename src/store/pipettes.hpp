#pragma once
// Pipettes (schema/004_pipettes.sql): the registry of piston pipettes and the conditions of their
// gravimetric check runs. Writes go through a Recorder (audited); nothing is updated or deleted.
#include <SQLiteCpp/Database.h>

#include <optional>
#include <string>
#include <vector>

#include "checks/pipette.hpp"
#include "core/dates.hpp"
#include "core/decimal.hpp"
#include "core/units.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::store {

/// A pipette with the attributes in force (today, or on the date it was read for).
struct PipetteRecord {
  checks::PipetteDefinition definition;  ///< id, fixed/variable, nominal, range, channels, limits
  InstrumentIdentity identity;
  std::string location;
  Interval every;
  Date created_on;  ///< the first check is due on this date

  [[nodiscard]] const std::string& id() const { return definition.id; }
};

/// The conditions of one gravimetric run, as entered.
struct PipetteRunConditions {
  std::int64_t run_id = 0;
  std::string balance_id;
  std::int64_t balance_run_id = 0;  ///< the balance's latest check on or before the run date
  Decimal water_temperature_c;
  Decimal air_pressure_hpa;
  Decimal humidity_pct;
  std::optional<ExactMass> evaporation;  ///< per weighing
};

void add_pipette(Recorder& rec, const PipetteRecord& p);
std::optional<PipetteRecord> find_pipette(SQLite::Database& db, const std::string& id);
/// The pipette with the attributes (location, interval, identity) in force on `on`.
std::optional<PipetteRecord> find_pipette_on(SQLite::Database& db, const std::string& id, Date on);
std::vector<PipetteRecord> list_pipettes(SQLite::Database& db);

void add_pipette_run_conditions(RowGroup& group, const PipetteRunConditions& c);
std::optional<PipetteRunConditions> find_pipette_run_conditions(SQLite::Database& db, std::int64_t run_id);

/// The latest run (by date, then id) of an instrument performed on or before `on` that has not been
/// superseded: what was current for that instrument on that day.
std::optional<RunRecord> latest_run_on_or_before(SQLite::Database& db, const std::string& instrument_id, Date on);

/// The readings series name of one test volume and channel, e.g. "100 uL channel 1".
std::string pipette_series(ExactVolume volume, int channel);

}  // namespace plumb::store
