#include "store/canonical_json.hpp"

#include <fmt/format.h>

#include <nlohmann/json.hpp>

namespace plumb::store {

void append_json_string(std::string& out, std::string_view text) {
  // The common case, printable ASCII, is copied with '"' and '\' escaped; anything else (control
  // characters, UTF-8) goes through nlohmann's own serializer so that both always agree.
  bool plain = true;
  for (const char c : text) {
    const auto u = static_cast<unsigned char>(c);
    if (u < 0x20 || u >= 0x7f) {
      plain = false;
      break;
    }
  }
  if (!plain) {
    out += nlohmann::json(std::string(text)).dump();
    return;
  }
  out += '"';
  for (const char c : text) {
    if (c == '"' || c == '\\') out += '\\';
    out += c;
  }
  out += '"';
}

void append_json_value(std::string& out, const Value& value) {
  switch (value.kind()) {
    case Value::Kind::null: out += "null"; break;
    case Value::Kind::integer: fmt::format_to(std::back_inserter(out), "{}", value.integer()); break;
    case Value::Kind::text: append_json_string(out, value.text()); break;
  }
}

}  // namespace plumb::store
