// Free text printed on one line (report/format/text.hpp printable): nothing in a name or reason can end the
// line, start a forged one, move the cursor or reorder what a terminal shows. Code points from the Unicode
// standard's tables (from memory): U+0085 NEL, U+2028 LINE SEPARATOR, U+202E RIGHT-TO-LEFT OVERRIDE.
#include <catch2/catch.hpp>

#include "report/format/text.hpp"

using plumb::report::printable;

TEST_CASE("printable escapes what could break or reorder a line", "[unit][printable]") {
  CHECK(printable("A. Technician") == "A. Technician");
  CHECK(printable("Zoë Ångström") == "Zoë Ångström");  // ordinary letters stay as they are
  CHECK(printable("a\nb") == "a\\nb");
  CHECK(printable("a\r\nb\tc") == "a\\r\\nb\\tc");
  CHECK(printable("\x1b[2Jcleared") == "\\x1b[2Jcleared");  // an ANSI escape cannot clear the screen
  CHECK(printable("del\x7f") == "del\\x7f");
  CHECK(printable("next\xc2\x85line") == "next\\x85line");        // U+0085 NEL
  CHECK(printable("sep\xe2\x80\xa8line") == "sep\\u{2028}line");  // U+2028
  CHECK(printable("abc\xe2\x80\xae"
                  "def") == "abc\\u{202e}def");  // U+202E
  CHECK(printable("bad\xff") == "bad\\xff");     // not UTF-8
  CHECK(printable("cut\xc3") == "cut\\xc3");     // a sequence cut short
  CHECK(printable("") == "");
}
