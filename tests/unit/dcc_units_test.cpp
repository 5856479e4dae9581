// The one table of D-SI unit texts (report/dcc/units.hpp) and the decimal texts a DCC carries. Unit spellings:
// \gram, \milli\gram and \micro\litre as reference-data/dcc/README.md gives them; the others as the D-SI 2.1.0
// unit list was remembered (from memory): \kilogram, \percent, \degreecelsius, \hecto\pascal, \one, and
// products and powers by juxtaposition and \tothe{n}. The D-SI decimal pattern is SI_Format-2.1.0.xsd's.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>
#include <set>

#include "core/errors.hpp"
#include "report/dcc/quantity.hpp"
#include "report/dcc/units.hpp"

namespace dcc = plumb::report::dcc;
using dcc::Unit;

TEST_CASE("dcc units: every unit has one D-SI text, spelt as D-SI spells it", "[dcc][units]") {
  CHECK(dcc::dsi_text(Unit::gram) == "\\gram");
  CHECK(dcc::dsi_text(Unit::milligram) == "\\milli\\gram");
  CHECK(dcc::dsi_text(Unit::microgram) == "\\micro\\gram");
  CHECK(dcc::dsi_text(Unit::kilogram) == "\\kilogram");
  CHECK(dcc::dsi_text(Unit::microlitre) == "\\micro\\litre");
  CHECK(dcc::dsi_text(Unit::millilitre) == "\\milli\\litre");
  CHECK(dcc::dsi_text(Unit::percent) == "\\percent");
  CHECK(dcc::dsi_text(Unit::degree_celsius) == "\\degreecelsius");
  CHECK(dcc::dsi_text(Unit::hectopascal) == "\\hecto\\pascal");
  CHECK(dcc::dsi_text(Unit::kilogram_per_cubic_metre) == "\\kilogram\\metre\\tothe{-3}");
  CHECK(dcc::dsi_text(Unit::microlitre_per_milligram) == "\\micro\\litre\\milli\\gram\\tothe{-1}");
  CHECK(dcc::dsi_text(Unit::one) == "\\one");
  // One row per unit, no text twice.
  std::set<Unit> units;
  std::set<std::string_view> texts;
  for (const auto& row : dcc::unit_table()) {
    units.insert(row.unit);
    texts.insert(row.dsi);
  }
  CHECK(units.size() == dcc::unit_table().size());
  CHECK(texts.size() == dcc::unit_table().size());
  CHECK(units.size() == 12);
}

TEST_CASE("dcc units: reading a D-SI mass unit gives its power of ten to the gram", "[dcc][units]") {
  CHECK(dcc::find_dsi_unit("\\gram")->exponent_to_base == 0);
  CHECK(dcc::find_dsi_unit("\\milli\\gram")->exponent_to_base == -3);
  CHECK(dcc::find_dsi_unit("\\micro\\gram")->exponent_to_base == -6);
  CHECK(dcc::find_dsi_unit("\\kilogram")->exponent_to_base == 3);
  CHECK(dcc::find_dsi_unit("\\kilo\\gram")->exponent_to_base == 3);
  CHECK(dcc::find_dsi_unit("\\kilogram")->dimension == dcc::Dimension::mass);
  CHECK(dcc::find_dsi_unit("\\micro\\litre")->dimension == dcc::Dimension::volume);
  CHECK_FALSE(dcc::find_dsi_unit("mg"));
  CHECK_FALSE(dcc::find_dsi_unit("\\gramm"));
  CHECK_FALSE(dcc::find_dsi_unit(""));
}

TEST_CASE("dcc decimals: the D-SI pattern, and exact plain text from scientific notation", "[dcc][units]") {
  for (const char* good : {"0.0001", "-0.5", "+2", "100.", ".5", "1.5e-05", "2E3"}) {
    INFO(good);
    CHECK(dcc::is_dsi_decimal(good));
  }
  for (const char* bad : {"", "nan", "inf", "1,5", "0x10", "1e", "about 5", "- 1"}) {
    INFO(bad);
    CHECK_FALSE(dcc::is_dsi_decimal(bad));
  }
  // By hand: shifting the point, no rounding.
  CHECK(*dcc::plain_decimal("1.5E-5") == "0.000015");
  CHECK(*dcc::plain_decimal("100.00004") == "100.00004");
  CHECK(*dcc::plain_decimal("4e-5") == "0.00004");
  CHECK(*dcc::plain_decimal("-3.0E-2") == "-0.030");
  CHECK(*dcc::plain_decimal("+2") == "2");
  CHECK(*dcc::plain_decimal(".5") == "0.5");
  CHECK(*dcc::plain_decimal("2E3") == "2000");
  CHECK(*dcc::plain_decimal("0.00") == "0.00");
  CHECK(*dcc::plain_decimal("00012.5") == "12.5");
  CHECK_FALSE(dcc::plain_decimal("1e99999"));
  CHECK_FALSE(dcc::plain_decimal("n/a"));
}

TEST_CASE("dcc decimals: stored values are written as stored, refused when a DCC cannot carry them", "[dcc][units]") {
  CHECK(dcc::decimal_text(nlohmann::json("100.00003"), "x") == "100.00003");  // exact text kept, digits and all
  CHECK(dcc::decimal_text(nlohmann::json(10), "x") == "10");
  CHECK(dcc::decimal_text(nlohmann::json(0.0001), "x") == "0.0001");
  CHECK(std::stod(dcc::decimal_text(nlohmann::json(1.2195121951370703e-05), "x")) == 1.2195121951370703e-05);
  CHECK_THROWS_AS(dcc::decimal_text(nlohmann::json(), "x"), plumb::StorageError);
  CHECK_THROWS_AS(dcc::decimal_text(nlohmann::json("n/a"), "x"), plumb::StorageError);
  CHECK_THROWS_AS(dcc::decimal_text(nlohmann::json(std::numeric_limits<double>::infinity()), "x"), plumb::StorageError);
  // Coverage probability of a bare k, normal distribution: 2 Phi(k) - 1 (GUM 6.2.2 and G.1.3): k = 2 gives
  // 0.9545, k = 1 gives 0.6827, k = 3 gives 0.9973 (standard normal table, from memory).
  CHECK(dcc::normal_coverage_probability(nlohmann::json("2")) == "0.9545");
  CHECK(dcc::normal_coverage_probability(nlohmann::json("1")) == "0.6827");
  CHECK(dcc::normal_coverage_probability(nlohmann::json("3")) == "0.9973");
  CHECK_THROWS_AS(dcc::normal_coverage_probability(nlohmann::json("0.5")), plumb::StorageError);
}
