#pragma once
// Run selectors as a person types them: a run number or LAST.
#include <cstdint>
#include <string>

#include "store/database.hpp"

namespace plumb::app {

/// "LAST" or a run number; InputError when there is no such run.
std::int64_t resolve_run(store::Database& db, const std::string& selector);

}  // namespace plumb::app
