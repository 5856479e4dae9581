#pragma once
// Text a person typed or a file carried (a name, a reason, a location, an id, a CSV field): plumb stores it,
// hashes it into the audit trail and prints it again, so it must be valid UTF-8 and hold nothing that could
// change how it is shown. A line break in an operator's name would let `audit log` print a forged line; a
// bidirectional override (U+202E) would make "W100" read as something else; a byte that is not UTF-8 cannot
// go into the trail's JSON at all.
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

namespace plumb {

/// What is wrong with a text, at which character (1-based) and byte offset (0-based).
struct TextFault {
  std::string what;  ///< e.g. "a line break (U+000A)", "a byte that is not UTF-8 (0xFF)"
  std::size_t character = 0;
  std::size_t byte = 0;
};

/// The first fault of `text`, or nullopt when it is fit to store: well-formed UTF-8 (RFC 3629: no overlong
/// form, no surrogate, nothing above U+10FFFF, no stray continuation byte) without control characters (C0
/// U+0000-U+001F, DEL U+007F, C1 U+0080-U+009F), bidirectional marks, embeddings, overrides and isolates
/// (U+061C, U+200E, U+200F, U+202A-U+202E, U+2066-U+2069) or the line and paragraph separators U+2028/U+2029.
std::optional<TextFault> text_fault(std::string_view text);

/// Throws InputError naming `field` and showing `text` on one line when text_fault finds anything.
void check_text_field(std::string_view text, std::string_view field);

/// `text` fit for one line of a message or listing: each fault text_fault would find is written as an
/// escape (\n, \t, \r, \u202E, \xFF for a byte that is not UTF-8), everything else as it is.
std::string shown_on_one_line(std::string_view text);

}  // namespace plumb
