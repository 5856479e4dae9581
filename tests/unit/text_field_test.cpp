// The one rule for stored text (src/core/text_field.hpp). The byte sequences are those of the table of
// well-formed UTF-8 in The Unicode Standard, chapter 3, Table 3-7, and RFC 3629 section 3 (its examples of
// overlong and surrogate forms), worked out by hand here; the control ranges are those of ISO/IEC 6429 (C0,
// C1) and the bidirectional formatting characters of Unicode Standard Annex #9 (from memory).
#include <catch2/catch.hpp>

#include "core/errors.hpp"
#include "core/text_field.hpp"

using namespace plumb;

TEST_CASE("plain text in any script passes", "[text_field]") {
  CHECK_FALSE(text_fault("A. Technician"));
  CHECK_FALSE(text_fault("\xC3\x85ngstr\xC3\xB6m-Labor M\xC3\xBCller"));  // Ångström-Labor Müller
  CHECK_FALSE(
      text_fault("\xCE\xBC"
                 "g"));                                 // µg with U+03BC
  CHECK_FALSE(text_fault("\xE6\x9D\xB1\xE4\xBA\xAC"));  // two CJK characters, 3 bytes each
  CHECK_FALSE(text_fault("\xF0\x9F\xA7\xAA"));          // U+1F9EA, 4 bytes
  CHECK_FALSE(text_fault("\xF4\x8F\xBF\xBD"));          // U+10FFFD, the last plane's top
  CHECK_FALSE(text_fault(""));
  CHECK_NOTHROW(check_text_field("Room 2, bench 3", "--location"));
}

TEST_CASE("bytes that are not well-formed UTF-8 are refused at the byte", "[text_field]") {
  // C0 AF: "/" in an overlong two-byte form (RFC 3629 section 10); C1 is never a lead byte.
  const auto overlong = text_fault("a\xC0\xAF");
  REQUIRE(overlong);
  CHECK(overlong->byte == 1);
  CHECK(overlong->character == 2);
  CHECK_THAT(overlong->what, Catch::Contains("0xC0"));
  CHECK(text_fault("\xC1\xBF"));
  CHECK(text_fault("\xE0\x80\xAF"));        // "/" overlong in three bytes: E0 must be followed by A0..BF
  CHECK(text_fault("\xF0\x80\x80\xAF"));    // and in four: F0 must be followed by 90..BF
  CHECK(text_fault("\xED\xA0\x80"));        // U+D800, a surrogate: ED must be followed by 80..9F
  CHECK(text_fault("\xED\xBF\xBF"));        // U+DFFF
  CHECK_FALSE(text_fault("\xED\x9F\xBF"));  // U+D7FF, just below the surrogates, is fine
  CHECK(text_fault("\xF4\x90\x80\x80"));    // U+110000, above the last code point
  CHECK(text_fault("\xF5\x80\x80\x80"));
  CHECK(text_fault("\x80"));  // a lone continuation byte
  CHECK(text_fault("ab\xBF"));
  CHECK(text_fault("\xC3"));  // a lead byte at the end (truncated)
  CHECK(text_fault("\xE2\x82"));
  CHECK(text_fault("\xFF"));
  CHECK(text_fault("\xFE"));
}

TEST_CASE("control, bidirectional and separator characters are refused", "[text_field]") {
  const auto line_break = text_fault("A. Tech\n#99 forged");
  REQUIRE(line_break);
  CHECK(line_break->character == 8);
  CHECK_THAT(line_break->what, Catch::Contains("line break") && Catch::Contains("U+000A"));
  CHECK(text_fault(std::string_view("a\0b", 3)));  // NUL
  CHECK(text_fault("a\tb"));
  CHECK(text_fault("a\rb"));
  CHECK(text_fault("\x1B[31mred"));  // escape: a terminal colour sequence
  CHECK(text_fault("\x01"));
  CHECK(text_fault("\x1F"));
  CHECK(text_fault("\x7F"));            // DEL
  CHECK(text_fault("\xC2\x80"));        // U+0080, first C1 control
  CHECK(text_fault("\xC2\x9F"));        // U+009F, last C1 control
  CHECK_FALSE(text_fault("\xC2\xA0"));  // U+00A0 no-break space is text
  const auto override = text_fault(
      "W100\xE2\x80\xAE"
      "gk");  // U+202E right-to-left override
  REQUIRE(override);
  CHECK_THAT(override->what, Catch::Contains("U+202E") && Catch::Contains("bidirectional"));
  CHECK(text_fault("\xE2\x80\xAA"));        // U+202A
  CHECK(text_fault("\xE2\x80\x8F"));        // U+200F right-to-left mark
  CHECK(text_fault("\xE2\x81\xA6"));        // U+2066 left-to-right isolate
  CHECK(text_fault("\xE2\x81\xA9"));        // U+2069 pop directional isolate
  CHECK(text_fault("\xD8\x9C"));            // U+061C Arabic letter mark
  CHECK(text_fault("\xE2\x80\xA8"));        // U+2028 line separator
  CHECK(text_fault("\xE2\x80\xA9"));        // U+2029 paragraph separator
  CHECK_FALSE(text_fault("\xE2\x80\x8C"));  // U+200C zero-width non-joiner, needed in Persian words
}

TEST_CASE("a refused text is named by its field and shown on one line", "[text_field]") {
  CHECK_THROWS_AS(check_text_field("A.\nTech", "--by"), InputError);
  CHECK_THROWS_WITH(
      check_text_field("A.\nTech", "--by"),
      "--by \"A.\\nTech\" holds a line break (U+000A) at character 3; write it as plain text on one line.");
  CHECK_THROWS_WITH(check_text_field("RC\xFF", "--certificate"), Catch::StartsWith("--certificate \"RC\\xFF\""));
  CHECK(shown_on_one_line("a\tb\nc\x1B\xE2\x80\xAE"
                          "d\xC0") == "a\\tb\\nc\\x1B\\u202Ed\\xC0");
  CHECK(shown_on_one_line("M\xC3\xBCller") == "M\xC3\xBCller");
}
