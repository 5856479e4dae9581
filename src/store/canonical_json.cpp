#include "store/canonical_json.hpp"

#include <fmt/format.h>

#include <array>

#include <nlohmann/json.hpp>

namespace plumb::store {

namespace {

/// Per byte: 0 copied as is, 1 escaped with a backslash ('"', '\\'), 2 anything else (control characters,
/// bytes of UTF-8 sequences), which is left to nlohmann.
constexpr std::array<unsigned char, 256> escape_class = [] {
  std::array<unsigned char, 256> c{};
  for (std::size_t b = 0; b < 256; ++b) c[b] = (b < 0x20 || b >= 0x7f) ? 2 : 0;
  c['"'] = c['\\'] = 1;
  return c;
}();

}  // namespace

void append_json_string(std::string& out, std::string_view text) {
  // The common case, printable ASCII, is written with '"' and '\\' escaped in one branch-free pass over a
  // buffer of the largest size it can need (a backslash is written before every character and kept only
  // where it belongs); anything else (control characters, UTF-8) goes through nlohmann's own serializer so
  // that both always agree. Audit records escape a kilobyte of JSON per check run, a quote every few bytes.
  const std::size_t start = out.size();
  out.resize(start + 2 * text.size() + 2);
  char* p = out.data() + start;
  *p++ = '"';
  for (const char c : text) {
    const unsigned char kind = escape_class[static_cast<unsigned char>(c)];
    if (kind == 2) {
      out.resize(start);
      out += nlohmann::json(std::string(text)).dump();
      return;
    }
    *p = '\\';
    p += kind;
    *p++ = c;
  }
  *p++ = '"';
  out.resize(static_cast<std::size_t>(p - out.data()));
}

void append_json_integer(std::string& out, std::int64_t value) {
  const fmt::format_int digits(value);
  out.append(digits.data(), digits.size());
}

void append_json_value(std::string& out, const Value& value) {
  switch (value.kind()) {
    case Value::Kind::null: out += "null"; break;
    case Value::Kind::integer: append_json_integer(out, value.integer()); break;
    case Value::Kind::text: append_json_string(out, value.text()); break;
  }
}

}  // namespace plumb::store
