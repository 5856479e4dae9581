#pragma once
// Stored values read back into their types. A value plumb did not write (an unknown procedure key, say) is
// a StorageError naming the column: the database was changed behind plumb's back or by a newer version.
#include <SQLiteCpp/Column.h>

#include <optional>

#include "checks/procedure.hpp"
#include "core/dates.hpp"
#include "core/units.hpp"
#include "store/row.hpp"

namespace plumb::store {

checks::Procedure stored_procedure(const SQLite::Column& c);
/// An exact mass stored as decimal text in grams.
ExactMass stored_grams(const SQLite::Column& c);
std::optional<ExactMass> stored_grams_or_none(const SQLite::Column& c);
/// An exact mass to store: decimal text in grams, or NULL.
Value grams_value(const std::optional<ExactMass>& m);
/// A date stored as ISO 8601 text.
Date stored_date(const SQLite::Column& c);

}  // namespace plumb::store
