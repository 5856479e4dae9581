#pragma once
// The recent history stored inside a certificate, so that its PDF chart is a rendering of the stored,
// hashed document like the rest of it (and a later correction never changes an issued certificate).
#include <nlohmann/json.hpp>

#include "store/database.hpp"
#include "store/records.hpp"

namespace plumb::app {

/// How many recent results a certificate's chart shows.
inline constexpr std::size_t certificate_history_points = 26;

/// The instrument's first chartable quantity (bias for a balance) over its last current results up to and
/// including `run`'s date: {"quantity", "label", "unit", "lower", "upper", "tolerance_basis",
/// "uncertainty_basis", "points": [{"run_id", "date", "value", "u"}]}. Null when nothing is chartable.
nlohmann::json certificate_history(store::Database& db, const store::RunRecord& run);

}  // namespace plumb::app
