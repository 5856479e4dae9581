#pragma once
// Every labelled value a Document shows, in reading order: the JSON rendering of a certificate carries them
// beside the stored record, and the parity test checks that each appears in every other rendering.
#include <nlohmann/json.hpp>

#include "report/document/document.hpp"

namespace plumb::report {

/// [{"section": "Instrument", "label": "Serial number", "value": "NF-0042"}, ...]; a table cell's label is its
/// column header and its row's first cell ("U / mg, W200").
nlohmann::json document_values(const Document& doc);

}  // namespace plumb::report
