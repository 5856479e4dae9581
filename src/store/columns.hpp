#pragma once
// Stored values read back into their types. A value plumb did not write (an unknown procedure key, say) is
// a StorageError naming the column: the database was changed behind plumb's back or by a newer version.
#include <SQLiteCpp/Column.h>

#include "checks/procedure.hpp"

namespace plumb::store {

checks::Procedure stored_procedure(const SQLite::Column& c);

}  // namespace plumb::store
