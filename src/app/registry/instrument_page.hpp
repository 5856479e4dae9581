#pragma once
// Everything about one instrument on one page (`balance show`, `pipette show`): its attributes now and their
// history, where it stands (the same standing as `due` and `summary`), its runs and their certificates.
#include <nlohmann/json.hpp>
#include <string>

#include "core/dates.hpp"
#include "store/database.hpp"

namespace plumb::app {

/// The page as JSON (rendered as text by report::instrument_page_text). InputError when `id` is not an
/// instrument of `kind` ("balance" or "pipette").
nlohmann::json instrument_page(store::Database& db, const std::string& kind, const std::string& id, Date on);

}  // namespace plumb::app
