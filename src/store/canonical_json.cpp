#include "store/canonical_json.hpp"

#include <fmt/format.h>

#include <array>
#include <cstdint>
#include <cstring>

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

/// The first byte at or after `i` that is not copied as is (escape_class not 0), or text.size(). Eight bytes
/// at a time while none of them is special (bit tricks on a 64-bit word), then byte by byte: audit records
/// escape a kilobyte of JSON per check run, nearly all of it plain.
std::size_t next_special(std::string_view text, std::size_t i) {
  constexpr std::uint64_t ones = 0x0101010101010101ULL, highs = 0x8080808080808080ULL;
  const auto has_zero_byte = [](std::uint64_t v) { return (v - ones) & ~v & highs; };
  for (; i + 8 <= text.size(); i += 8) {
    std::uint64_t x = 0;
    std::memcpy(&x, text.data() + i, 8);
    const std::uint64_t special = (x & highs) |                  // >= 0x80: UTF-8
                                  ((x - 0x20 * ones) & ~x & highs) |  // < 0x20: control characters
                                  has_zero_byte(x ^ (0x7f * ones)) | has_zero_byte(x ^ (0x22 * ones)) |
                                  has_zero_byte(x ^ (0x5c * ones));
    if (special != 0) break;
  }
  while (i < text.size() && escape_class[static_cast<unsigned char>(text[i])] == 0) ++i;
  return i;
}

}  // namespace

void append_json_string(std::string& out, std::string_view text) {
  // The common case, printable ASCII, is copied in runs with '"' and '\\' escaped; anything else (control
  // characters, UTF-8) goes through nlohmann's own serializer so that both always agree.
  const std::size_t start = out.size();
  out.reserve(start + text.size() + text.size() / 4 + 2);
  out += '"';
  std::size_t from = 0;
  for (std::size_t i = next_special(text, 0); i < text.size(); i = next_special(text, i + 1)) {
    if (escape_class[static_cast<unsigned char>(text[i])] == 2) {
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
