// The balance line parser (core/balance_line) and the line splitter (core/line_splitter). The line shapes are
// the generic ones doc/capture.md lists; every expected value is read off the line by hand.
#include <catch2/catch.hpp>

#include "core/balance_line.hpp"
#include "core/errors.hpp"
#include "core/line_splitter.hpp"

using namespace plumb;

namespace {

BalanceLineReading read(std::string_view line, const LinePattern* pattern = nullptr) {
  const auto r = read_balance_line(line, pattern);
  REQUIRE(r.has_value());
  return *r;
}

}  // namespace

TEST_CASE("common line shapes: value, unit and stability as displayed", "[balance_line]") {
  // Value and unit, padded, with a + sign and leading zeros that pad the field: the displayed digits stay,
  // trailing zeros included (they carry the readability).
  auto r = read("+  0100.0010 g\r\n");
  CHECK(r.text == "100.0010");
  CHECK(r.value == Decimal(1000010, 4));
  CHECK(r.value.scale() == 4);
  CHECK(r.unit == MassUnit::g);
  CHECK(r.stable);
  // A minus sign separated from the digits by spaces.
  r = read("-     0.0012 g");
  CHECK(r.text == "-0.0012");
  CHECK(r.value == Decimal(-12, 4));
  // No space between value and unit; another unit.
  r = read("100001.2mg");
  CHECK(r.unit == MassUnit::mg);
  CHECK(r.text == "100001.2");
  // A trailing ? marks an unstable reading; a leading one too.
  CHECK_FALSE(read("  100.0012 g ?").stable);
  CHECK_FALSE(read("? 100.0012 g").stable);
  // A stability word before the value: S / U, ST / US (with or without a comma), S / D.
  CHECK(read("S      100.0012 g").stable);
  CHECK_FALSE(read("U      100.0012 g").stable);
  CHECK(read("ST,+100.0012 g").stable);
  CHECK_FALSE(read("US,+100.0013 g").stable);
  CHECK_FALSE(read("US +100.0013 g").stable);
  CHECK_FALSE(read("D  100.0013 g").stable);
  // A unit plumb does not weigh in is read, and left without a MassUnit, for the capture to refuse.
  r = read("100.0012 ct");
  CHECK(r.unit_text == "ct");
  CHECK_FALSE(r.unit.has_value());
  // The micro sign in UTF-8.
  CHECK(read("12.5 \xC2\xB5g").unit == MassUnit::ug);
}

TEST_CASE("lines that are not readings", "[balance_line]") {
  for (const std::string_view line : {"", "   ", "Err 4", "-------", "100.0012", "g 100.0012", "1.2.3 g", "100. g",
                                      "\x01\x02\xFF", "ST,,100 g", "100.0012 g ? extra"}) {
    INFO(escaped_line(line));
    CHECK_FALSE(read_balance_line(line).has_value());
  }
  // Longer than any balance line: not read, however it ends.
  CHECK_FALSE(read_balance_line(std::string(300, ' ') + "100.0012 g").has_value());
  CHECK_FALSE(read_balance_line(std::string(250, '1') + " g").has_value());
  // More digits than a reading can hold exactly.
  CHECK_FALSE(read_balance_line("100.0000000000001 g").has_value());
}

TEST_CASE("a lab-defined line pattern", "[balance_line]") {
  // A shape none of the common ones covers: a label, the mark after the unit, a literal '*' (escaped).
  const auto p = LinePattern::parse("NET: {value} {unit} {mark:OK|MOVING} \\*", "--line-pattern");
  auto r = read("NET:   +12.345 g OK *", &p);
  CHECK(r.text == "12.345");
  CHECK(r.value == Decimal(12345, 3));
  CHECK(r.stable);
  CHECK_FALSE(read("NET: 12.346 g MOVING *", &p).stable);
  CHECK_FALSE(read_balance_line("NET: 12.346 g MAYBE *", &p).has_value());
  // The pattern replaces the common shapes, not adds to them.
  CHECK_FALSE(read_balance_line("12.346 g", &p).has_value());
  // * skips any text: a sequence number and a date before the reading.
  const auto skip = LinePattern::parse("#* {value}{unit}", "--line-pattern");
  CHECK(read("#0042 2026-12-01 100.0001g", &skip).text == "100.0001");
  // Characters regexes treat specially stand for themselves.
  const auto special = LinePattern::parse("[{value}] ({unit})^$.+|", "--line-pattern");
  CHECK(read("[ 5.00] (g)^$.+|", &special).text == "5.00");
  CHECK_FALSE(read_balance_line("[ 5.00] (g)^$X+|", &special).has_value());
}

TEST_CASE("a bad line pattern is refused with one sentence naming the field", "[balance_line]") {
  const auto bad = [](std::string_view p) { return LinePattern::parse(p, "--line-pattern"); };
  CHECK_THROWS_WITH(bad("{unit}"), "--line-pattern \"{unit}\" has no {value}.");
  CHECK_THROWS_WITH(bad("{value}"), "--line-pattern \"{value}\" has no {unit}.");
  CHECK_THROWS_WITH(bad("{value} {value} {unit}"), "--line-pattern \"{value} {value} {unit}\" has {value} twice.");
  CHECK_THROWS_WITH(bad("{value} {unit} {weight}"),
                    "--line-pattern \"{value} {unit} {weight}\" has {weight}, which is not {value}, {unit} or "
                    "{mark:STABLE|UNSTABLE}.");
  CHECK_THROWS_WITH(bad("{mark:S} {value} {unit}"),
                    "--line-pattern \"{mark:S} {value} {unit}\" has a {mark:...} that is not {mark:STABLE|UNSTABLE}.");
  CHECK_THROWS_WITH(bad("{mark:S|S} {value} {unit}"), Catch::Contains("stable and unstable marks are the same"));
  CHECK_THROWS_WITH(bad("{value {unit}"), Catch::Contains("which is not {value}"));
  CHECK_THROWS_WITH(bad("{value} {unit"), "--line-pattern \"{value} {unit\" has a { without its }.");
  CHECK_THROWS_WITH(bad("{value} {unit}\\"), Catch::Contains("ends with a \\ that escapes nothing"));
  CHECK_THROWS_WITH(bad("{value}\t{unit}"), "--line-pattern \"{value}\\x09{unit}\" contains a control character.");
  CHECK_THROWS_AS(bad(std::string(101, 'x')), InputError);
}

TEST_CASE("received lines are stored escaped: garbage stays visible", "[balance_line]") {
  CHECK(escaped_line("ST,+100.0012 g") == "ST,+100.0012 g");
  CHECK(escaped_line(std::string("\x00\x1B\xFF\\", 4)) == "\\x00\\x1B\\xFF\\\\");
  CHECK(escaped_line("\xC2\xB5g") == "\\xC2\\xB5g");
}

TEST_CASE("line splitter joins pieces and splits at CR, LF and CR LF", "[balance_line]") {
  LineSplitter s;
  s.feed("+100.00");
  CHECK_FALSE(s.next().has_value());
  CHECK(s.unfinished() == "+100.00");
  s.feed("12 g\r");
  s.feed("\n+100.0013 g\n\n+100.0011 g\r+1");
  CHECK(s.next() == "+100.0012 g");
  CHECK(s.next() == "+100.0013 g");
  CHECK(s.next() == "+100.0011 g");
  CHECK_FALSE(s.next().has_value());
  CHECK(s.unfinished() == "+1");
  // Bytes without a line end come out once they reach the longest line, so garbage cannot grow the buffer.
  LineSplitter g;
  g.feed(std::string(longest_balance_line * 2 + 3, 'x'));
  CHECK(g.next() == std::string(longest_balance_line, 'x'));
  CHECK(g.next() == std::string(longest_balance_line, 'x'));
  CHECK_FALSE(g.next().has_value());
  CHECK(g.unfinished() == "xxx");
}
