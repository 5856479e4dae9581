// The one order of ids in every list (core/natural_order.hpp). Expected orders written out by hand.
#include <catch2/catch.hpp>

#include <algorithm>
#include <string>
#include <vector>

#include "core/natural_order.hpp"

using plumb::compare_natural;
using plumb::NaturalLess;

namespace {

std::vector<std::string> sorted(std::vector<std::string> ids) {
  std::sort(ids.begin(), ids.end(), NaturalLess{});
  return ids;
}

}  // namespace

TEST_CASE("natural order compares runs of digits by value", "[unit][natural-order]") {
  // Byte order would give W100G, W10G, W1MG (the complaint of issue 13); by value the numbers are 1, 10, 100.
  CHECK(sorted({"W100G", "W10G", "W1MG"}) == std::vector<std::string>{"W1MG", "W10G", "W100G"});
  CHECK(sorted({"BAL-10", "BAL-9", "BAL-1", "BAL-100"}) ==
        std::vector<std::string>{"BAL-1", "BAL-9", "BAL-10", "BAL-100"});
  CHECK(sorted({"P-07", "P-7b", "P-6", "P-10"}) == std::vector<std::string>{"P-6", "P-07", "P-7b", "P-10"});
  // Numbers longer than any integer type still compare by value (length of the significant digits first).
  CHECK(compare_natural("X123456789012345678901234567890", "X99999999999999999999999999999") > 0);
}

TEST_CASE("natural order ignores case first, then breaks every tie so the order is total", "[unit][natural-order]") {
  CHECK(compare_natural("ab-01", "AB-02") < 0);
  CHECK(compare_natural("AB-02", "ab-01") > 0);
  // Same text apart from case or leading zeros: not equal (a collation must not merge two ids), byte order decides.
  CHECK(compare_natural("AB-1", "ab-1") < 0);  // 'A' (0x41) before 'a' (0x61)
  CHECK(compare_natural("ab-1", "AB-1") > 0);
  CHECK(compare_natural("W01", "W1") < 0);  // '0' (0x30) before '1' (0x31)
  CHECK(compare_natural("W1", "W1") == 0);
  CHECK(compare_natural("", "") == 0);
  // A prefix comes first; letters after digits and digits after letters compare as characters.
  CHECK(compare_natural("W1", "W1A") < 0);
  CHECK(compare_natural("W", "W1") < 0);
  CHECK(compare_natural("1A", "A1") < 0);  // '1' (0x31) before 'a' (0x61)
}

TEST_CASE("natural order is a strict weak order over a mixed set", "[unit][natural-order]") {
  const std::vector<std::string> ids = {"W1", "w1", "W01", "W10", "W2", "W2a", "BAL-A", "bal-a", "", "10", "9", "A"};
  for (const auto& a : ids)
    for (const auto& b : ids) {
      INFO(a << " vs " << b);
      CHECK((compare_natural(a, b) == 0) == (a == b));
      CHECK((compare_natural(a, b) < 0) == (compare_natural(b, a) > 0));
      for (const auto& c : ids)
        if (compare_natural(a, b) < 0 && compare_natural(b, c) < 0) CHECK(compare_natural(a, c) < 0);
    }
}
