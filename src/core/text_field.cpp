#include "core/text_field.hpp"

#include <fmt/format.h>

#include "core/errors.hpp"

namespace plumb {
namespace {

// The decoding below follows the table of well-formed byte sequences in The Unicode Standard, chapter 3
// (Table 3-7, the same ranges as RFC 3629 section 4). No library of plumb's dependencies exposes a decoder of
// code points with this policy to a pure layer (nlohmann-json only refuses bad UTF-8 when it writes).
struct Decoded {
  std::int32_t code_point = -1;  ///< -1: not well-formed at this byte
  std::size_t length = 1;
};

bool continuation(unsigned char b, unsigned char lo = 0x80, unsigned char hi = 0xBF) {
  return b >= lo && b <= hi;
}

Decoded decode(std::string_view s, std::size_t i) {
  const auto at = [&](std::size_t k) {
    return i + k < s.size() ? static_cast<unsigned char>(s[i + k]) : static_cast<unsigned char>(0);
  };
  const unsigned char b0 = at(0);
  if (b0 < 0x80) return {b0, 1};
  if (b0 >= 0xC2 && b0 <= 0xDF && continuation(at(1))) return {((b0 & 0x1F) << 6) | (at(1) & 0x3F), 2};
  if (b0 >= 0xE0 && b0 <= 0xEF) {
    // E0 needs A0.. (else overlong); ED needs ..9F (else a surrogate, U+D800-U+DFFF).
    const unsigned char lo = b0 == 0xE0 ? 0xA0 : 0x80, hi = b0 == 0xED ? 0x9F : 0xBF;
    if (continuation(at(1), lo, hi) && continuation(at(2)))
      return {((b0 & 0x0F) << 12) | ((at(1) & 0x3F) << 6) | (at(2) & 0x3F), 3};
  }
  if (b0 >= 0xF0 && b0 <= 0xF4) {
    // F0 needs 90.. (else overlong); F4 needs ..8F (else above U+10FFFF).
    const unsigned char lo = b0 == 0xF0 ? 0x90 : 0x80, hi = b0 == 0xF4 ? 0x8F : 0xBF;
    if (continuation(at(1), lo, hi) && continuation(at(2)) && continuation(at(3)))
      return {((b0 & 0x07) << 18) | ((at(1) & 0x3F) << 12) | ((at(2) & 0x3F) << 6) | (at(3) & 0x3F), 4};
  }
  return {};
}

/// Why a well-formed code point may not stand in stored text, or nullptr.
const char* refusal(std::int32_t c) {
  if (c == 0x00) return "a NUL character";
  if (c == 0x09) return "a tab";
  if (c == 0x0A || c == 0x0D) return "a line break";
  if (c == 0x1B) return "an escape character";
  if (c < 0x20 || c == 0x7F) return "a control character";
  if (c >= 0x80 && c <= 0x9F) return "a C1 control character";
  if (c == 0x061C || c == 0x200E || c == 0x200F || (c >= 0x202A && c <= 0x202E) || (c >= 0x2066 && c <= 0x2069))
    return "a bidirectional control character";
  if (c == 0x2028 || c == 0x2029) return "a line or paragraph separator";
  return nullptr;
}

std::string escape(std::int32_t c) {
  switch (c) {
    case 0x09:
      return "\\t";
    case 0x0A:
      return "\\n";
    case 0x0D:
      return "\\r";
    default:
      return c < 0x80 ? fmt::format("\\x{:02X}", c) : fmt::format("\\u{:04X}", c);
  }
}

}  // namespace

std::optional<TextFault> text_fault(std::string_view text) {
  std::size_t character = 1;
  for (std::size_t i = 0; i < text.size(); ++character) {
    const Decoded d = decode(text, i);
    if (d.code_point < 0)
      return TextFault{fmt::format("a byte that is not UTF-8 (0x{:02X})", static_cast<unsigned char>(text[i])),
                       character, i};
    if (const char* why = refusal(d.code_point))
      return TextFault{fmt::format("{} (U+{:04X})", why, d.code_point), character, i};
    i += d.length;
  }
  return std::nullopt;
}

void check_text_field(std::string_view text, std::string_view field) {
  const auto fault = text_fault(text);
  if (!fault) return;
  throw InputError(fmt::format("{} \"{}\" holds {} at character {}; write it as plain text on one line.", field,
                               shown_on_one_line(text), fault->what, fault->character));
}

std::string shown_on_one_line(std::string_view text) {
  std::string out;
  out.reserve(text.size());
  for (std::size_t i = 0; i < text.size();) {
    const Decoded d = decode(text, i);
    if (d.code_point < 0) {
      out += fmt::format("\\x{:02X}", static_cast<unsigned char>(text[i]));
    } else if (refusal(d.code_point)) {
      out += escape(d.code_point);
    } else {
      out.append(text.substr(i, d.length));
    }
    i += d.length;
  }
  return out;
}

}  // namespace plumb
