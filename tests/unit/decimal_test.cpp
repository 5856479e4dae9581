#include <catch2/catch.hpp>

#include "core/decimal.hpp"
#include "core/errors.hpp"

using plumb::Decimal;
using plumb::InputError;

TEST_CASE("decimal text keeps its digits and scale", "[decimal]") {
  const Decimal d = Decimal::parse("100.0010");
  CHECK(d.units() == 1000010);
  CHECK(d.scale() == 4);
  CHECK(d.to_string() == "100.0010");  // trailing zeros carry the readability
  CHECK(d.significant_scale() == 3);
  CHECK(Decimal::parse("-0.05").to_string() == "-0.05");
  CHECK(Decimal::parse("+7").to_string() == "7");
  CHECK(Decimal::parse("0.0003").to_string() == "0.0003");
}

TEST_CASE("decimal arithmetic and comparison are exact", "[decimal]") {
  // 0.1 + 0.2 == 0.3 exactly, unlike binary floating point.
  CHECK(Decimal::parse("0.1") + Decimal::parse("0.2") == Decimal::parse("0.3"));
  CHECK(Decimal::parse("100") + Decimal::parse("0.00003") == Decimal::parse("100.00003"));
  CHECK(Decimal::parse("1.50") == Decimal::parse("1.5"));
  CHECK(Decimal::parse("-0.1") < Decimal::parse("0"));
  CHECK(Decimal::parse("0.03").shifted(-3).to_string() == "0.00003");
  CHECK(Decimal::parse("2").shifted(3).to_string() == "2000");
}

TEST_CASE("malformed decimals are refused with the field and value named", "[decimal]") {
  for (const char* bad : {"", "abc", "1.2.3", "1e5", ".5", "5.", "--1", "1,5", " 1", "0x10", "1.0000000000001"}) {
    INFO(bad);
    CHECK_THROWS_AS(Decimal::parse(bad, "reading"), InputError);
  }
  CHECK_THROWS_WITH(Decimal::parse("12a", "--nominal"), Catch::Contains("--nominal") && Catch::Contains("12a"));
  CHECK_THROWS_AS(Decimal::parse("99999999999999999999"), InputError);
  CHECK_THROWS_AS(Decimal::parse("1.25").rescaled(1), InputError);  // would lose a digit
}
