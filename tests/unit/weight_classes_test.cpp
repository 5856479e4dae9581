#include <catch2/catch.hpp>

#include "core/errors.hpp"
#include "metrology/weight_classes.hpp"

using namespace plumb;
using weights::WeightClass;

TEST_CASE("R 111 class names and lookups", "[unit][r111]") {
  CHECK(weights::all_classes().size() == 9);
  CHECK(weights::to_string(WeightClass::M1_2) == "M1-2");
  CHECK(weights::parse_weight_class("f1") == WeightClass::F1);
  CHECK(weights::parse_weight_class("M2-3") == WeightClass::M2_3);
  CHECK_THROWS_WITH(weights::parse_weight_class("E3", "class of W100"), Catch::Contains("class of W100"));
  // OIML R 111 Table 1 (from memory, cross-checked): F1 100 g -> 0.5 mg; E2 1 kg -> 1.6 mg.
  CHECK(*weights::mpe(WeightClass::F1, ExactMass::parse("100 g", "n")) == ExactMass::parse("0.5 mg", "m"));
  CHECK(*weights::mpe(WeightClass::E2, ExactMass::parse("1000 g", "n")) == ExactMass::parse("1.6 mg", "m"));
  // M2 (from memory only, not cross-checked): 10 x F2; 1 kg -> 160 mg.
  CHECK(*weights::mpe(WeightClass::M2, ExactMass::parse("1 kg", "n")) == ExactMass::parse("160 mg", "m"));
  CHECK_FALSE(weights::cross_checked(WeightClass::M2));
  // A nominal value outside the 1-2-5 series, or a class not defined there, has no MPE.
  CHECK_FALSE(weights::mpe(WeightClass::F1, ExactMass::parse("150 g", "n")).has_value());
  CHECK_FALSE(weights::mpe(WeightClass::M1_2, ExactMass::parse("1 kg", "n")).has_value());
  CHECK_THROWS_WITH(weights::mpe_or_throw(WeightClass::F1, ExactMass::parse("150 g", "n"), "W150"),
                    Catch::Contains("W150"));
  // The table is monotone: a finer class never has a larger MPE.
  for (const auto& n : weights::table_nominals()) {
    auto prev = weights::mpe(WeightClass::E1, n);
    for (auto c : {WeightClass::E2, WeightClass::F1, WeightClass::F2, WeightClass::M1}) {
      const auto cur = weights::mpe(c, n);
      REQUIRE(cur.has_value());
      CHECK(*prev <= *cur);
      prev = cur;
    }
  }
}
