#include "store/canonical_json.hpp"

#include <fmt/format.h>

#include <nlohmann/json.hpp>

namespace plumb::store {

void append_json_string(std::string& out, std::string_view text) {
  // The common case, printable ASCII, is copied in runs with '"' and '\' escaped, in one pass; anything else
  // (control characters, UTF-8) goes through nlohmann's own serializer so that both always agree.
  const std::size_t start = out.size();
  out.reserve(start + text.size() + text.size() / 4 + 2);
  out += '"';
  std::size_t from = 0;
  for (std::size_t i = 0; i < text.size(); ++i) {
    const auto u = static_cast<unsigned char>(text[i]);
    if (u >= 0x20 && u < 0x7f && u != '"' && u != '\\') continue;
    if (u < 0x20 || u >= 0x7f) {
      out.resize(start);
      out += nlohmann::json(std::string(text)).dump();
      return;
    }
    out.append(text.data() + from, i - from);
    out += '\\';
    from = i;  // the character itself is copied with the next run
  }
  out.append(text.data() + from, text.size() - from);
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
