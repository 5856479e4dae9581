// External checks: the project's OIML tables against shared/reference-data/metrology:
// - OIML R 111-1:2004 Table 1 (weight MPE, classes E1..M1): oiml-r111-weight-mpe.csv. Both the project's
//   table and the CSV are from memory, cross-checked; a slip on either side shows up here row by row.
// - OIML R 76-1:2006 Table 6 (MPE on initial verification by class and load in e): oiml-r76-mpe-bands.csv,
//   from memory, cross-checked.
#include <catch2/catch.hpp>

#include <string>

#include "core/decimal.hpp"
#include "metrology/accuracy_classes.hpp"
#include "metrology/weight_classes.hpp"
#include "support/csv.hpp"
#include "support/paths.hpp"

using namespace plumb;

TEST_CASE("OIML R 111 Table 1 matches the reference CSV row by row (from memory, cross-checked)",
          "[reference][oiml][r111]") {
  const auto root = test::reference_data();
  if (!root) {
    WARN("skipped OIML R 111 table check: shared/reference-data not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  const auto t = test::read_reference_csv(*root / "metrology" / "oiml-r111-weight-mpe.csv");
  REQUIRE(t.rows.size() == weights::table_nominals().size());
  int compared = 0;
  for (const auto& row : t.rows) {
    const ExactMass nominal = ExactMass::parse(row.at("nominal"), "nominal");
    for (const char* cls : {"E1", "E2", "F1", "F2", "M1"}) {
      const auto c = weights::parse_weight_class(cls);
      REQUIRE(weights::cross_checked(c));
      const auto expected = ExactMass::from(Decimal::parse(row.at(std::string(cls) + "_mg")), MassUnit::mg);
      const auto got = weights::mpe(c, nominal);
      INFO(row.at("nominal") << " class " << cls);
      REQUIRE(got.has_value());
      CHECK(*got == expected);
      ++compared;
    }
  }
  CHECK(compared == 24 * 5);
}

TEST_CASE("OIML R 76 Table 6 bands match the reference CSV (from memory, cross-checked)", "[reference][oiml][r76]") {
  const auto root = test::reference_data();
  if (!root) {
    WARN("skipped OIML R 76 table check: shared/reference-data not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  const auto t = test::read_reference_csv(*root / "metrology" / "oiml-r76-mpe-bands.csv");
  const auto bands = r76::bands();
  REQUIRE(t.rows.size() == bands.size());
  for (std::size_t i = 0; i < bands.size(); ++i) {
    const auto& row = t.rows[i];
    const auto& b = bands[i];
    INFO("row " << i + 1 << ": class " << row.at("class"));
    CHECK(r76::to_string(b.cls) == row.at("class"));
    CHECK(b.load_from_e == std::stoll(row.at("load_from_e")));
    if (row.at("load_to_e").empty()) {
      CHECK_FALSE(b.load_to_e.has_value());
    } else {
      REQUIRE(b.load_to_e.has_value());
      CHECK(*b.load_to_e == std::stoll(row.at("load_to_e")));
    }
    CHECK(Decimal(b.mpe_half_e * 5, 1) == Decimal::parse(row.at("mpe_e")));
    // And through the lookup, with e = 1 g at the top of the band (and just above its bottom):
    const ExactMass e = ExactMass::parse("1 g", "e");
    const ExactMass at = ExactMass::grams(Decimal(b.load_to_e.value_or(b.load_from_e + 1000), 0));
    CHECK(r76::mpe(b.cls, e, at, r76::Verification::initial) ==
          ExactMass::grams(Decimal::parse(row.at("mpe_e"))));
    const ExactMass just_above = ExactMass::grams(Decimal(b.load_from_e * 10 + 1, 1));
    CHECK(r76::mpe(b.cls, e, just_above, r76::Verification::initial) ==
          ExactMass::grams(Decimal::parse(row.at("mpe_e"))));
  }
}
