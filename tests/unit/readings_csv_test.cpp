#include <catch2/catch.hpp>

#include "core/errors.hpp"
#include "core/readings_csv.hpp"

using namespace plumb;

TEST_CASE("readings CSV keeps text, unit and exact value", "[csv]") {
  const auto r = parse_readings_csv("unit,reading\ng,100.0003\nmg,100000.1\n\n", "r.csv", MassUnit::g);
  REQUIRE(r.size() == 2);
  CHECK(r[0].reading.text == "100.0003");
  CHECK(r[0].line == 2);
  CHECK(r[1].reading.unit == MassUnit::mg);
  CHECK(r[1].reading.mass().in_grams() == Decimal::parse("100.0001"));
  const auto crlf = parse_readings_csv("\xEF\xBB\xBFreading\r\n1.5\r\n", "r.csv", MassUnit::mg);
  REQUIRE(crlf.size() == 1);
  CHECK(crlf[0].reading.mass().in_grams() == Decimal::parse("0.0015"));
}

TEST_CASE("readings CSV errors name file, line and column", "[csv]") {
  CHECK_THROWS_WITH(parse_readings_csv("reading\n1.0\nabc\n", "r.csv", MassUnit::g),
                    Catch::Contains("r.csv line 3") && Catch::Contains("abc"));
  CHECK_THROWS_WITH(parse_readings_csv("unit\ng\n", "r.csv", MassUnit::g), Catch::Contains("no \"reading\" column"));
  // A column plumb does not know, or one named twice, would be dropped without a word (issue 13).
  CHECK_THROWS_WITH(parse_readings_csv("value\n1.0\n", "r.csv", MassUnit::g),
                    "r.csv line 1: column \"value\" is not known (the header is reading[,unit]).");
  CHECK_THROWS_WITH(parse_readings_csv("reading,units\n1.0,g\n", "r.csv", MassUnit::g),
                    Catch::Contains("r.csv line 1: column \"units\" is not known"));
  CHECK_THROWS_WITH(parse_readings_csv("reading,Reading\n1.0,2.0\n", "r.csv", MassUnit::g),
                    "r.csv line 1: column \"Reading\" appears twice in the header.");
  CHECK_THROWS_WITH(parse_readings_csv("reading,unit\n1.0,g\x1B[0m\n", "r.csv", MassUnit::g),
                    Catch::StartsWith("r.csv line 2 column unit: value \"g\\x1B[0m\" holds an escape character"));
  CHECK_THROWS_WITH(parse_readings_csv("reading,unit\n1.0,mL\n", "r.csv", MassUnit::g),
                    Catch::Contains("line 2 column unit"));
  CHECK_THROWS_WITH(parse_readings_csv("reading\n\n1.0,2\n", "r.csv", MassUnit::g), Catch::Contains("line 3"));
  CHECK_THROWS_WITH(parse_readings_csv("reading\n\"\"\n", "r.csv", MassUnit::g), Catch::Contains("empty"));
  CHECK_THROWS_AS(parse_readings_csv("", "r.csv", MassUnit::g), InputError);
}
