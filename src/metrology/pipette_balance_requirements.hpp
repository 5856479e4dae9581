#pragma once
// ISO 8655-6:2002 Table 1: the balance a gravimetric pipette test needs, by selected test volume V.
// Rows are (from, to]: a volume on a boundary takes the lower row, the stricter one (10 uL needs a
// 0.001 mg balance); the first row also includes its lower end (1 uL). Volumes below 1 uL or above 200 mL
// are outside the table and refused.
//
// A balance is suitable for V when its readability d is no coarser than the table's, and its latest
// repeatability s (from its own weekly check; the caller picks a check that counts and met its own minimum
// of readings) is no larger than the table's. A balance with no repeatability
// on record is not suitable: the table asks for one. A standard uncertainty is checked when one is given.
// Whether the balance is in service and in date is the caller's to supply (BalanceForPipette::in_service, due).
#include <optional>
#include <string>
#include <vector>

#include "core/dates.hpp"
#include "core/decimal.hpp"
#include "core/units.hpp"

namespace plumb::pipette_balance {

// The mass columns stay decimals in mg, as the table states them (the results JSON is derived from them).
struct Requirement {
  ExactVolume volume_from;  ///< exclusive, except for the first row
  ExactVolume volume_to;    ///< inclusive
  Decimal readability_mg;
  Decimal repeatability_mg;
  Decimal standard_uncertainty_mg;
};

/// The table, ascending by volume. Source: ISO 8655-6:2002 Table 1, transcribed from memory.
const std::vector<Requirement>& iso8655_6_table();

/// The row that applies to `test_volume`; throws InputError outside 1 uL to 200 mL.
Requirement requirement_for(ExactVolume test_volume);

/// The balance used for a pipette run, as a CLI or store would describe it.
struct BalanceForPipette {
  std::string id;
  ExactMass readability;                       ///< d
  std::optional<Mass> repeatability;           ///< s from the latest repeatability check
  std::optional<Mass> standard_uncertainty;    ///< u of a weighing, if known
  bool in_service = true;
  std::optional<Date> due;                     ///< its calibration or check due date
};

struct Suitability {
  bool suitable = true;
  Requirement requirement;
  std::vector<std::string> reasons;  ///< why not suitable; empty when suitable
  std::vector<std::string> notes;    ///< what was not checked
};

/// Whether `balance` meets ISO 8655-6 Table 1 for `test_volume` (readability, repeatability, uncertainty).
Suitability assess(const BalanceForPipette& balance, ExactVolume test_volume);

/// Throws InputError when the balance is out of service or its due date is before `run_date`.
void require_usable(const BalanceForPipette& balance, Date run_date);

}  // namespace plumb::pipette_balance
