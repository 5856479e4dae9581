#pragma once
// Writing JSON text by hand, byte for byte as nlohmann::json::dump() writes it: the audit trail hashes
// the canonical JSON of each record, and a batch import writes hundreds of thousands of records, where
// building an nlohmann::json object per row would cost more than storing it.
#include <cstdint>
#include <string>
#include <string_view>

#include "store/row.hpp"

namespace plumb::store {

/// Appends `text` as a JSON string literal, exactly as nlohmann::json::dump() escapes it (a text that is
/// not valid UTF-8 is refused the same way).
void append_json_string(std::string& out, std::string_view text);
/// Appends an integer in decimal.
void append_json_integer(std::string& out, std::int64_t value);
/// Appends an integer, a string literal or null.
void append_json_value(std::string& out, const Value& value);

}  // namespace plumb::store
