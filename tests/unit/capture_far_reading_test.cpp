// The capture's warning for a reading far from the others (app/weekly_check/capture): said, never dropped.
// Worked by hand: others 100.0002, 100.0003, 100.0004 g have mean 100.0003 g and s = 0.1 mg (deviations -1, 0,
// +1 in 0.1 mg: sum of squares 2, over n - 1 = 2); with d = 0.1 mg the spread is 0.1 mg and the limit 0.4 mg.
#include <catch2/catch.hpp>

#include "app/weekly_check/capture.hpp"

using namespace plumb;

namespace {

ExactMass grams(const char* text) {
  return ExactMass::grams(Decimal::parse(text));
}

}  // namespace

TEST_CASE("a reading more than 4 spreads from the others is warned about", "[capture]") {
  const std::vector<ExactMass> others{grams("100.0002"), grams("100.0003"), grams("100.0004")};
  const ExactMass d = grams("0.0001");
  CHECK_FALSE(app::far_from_others(grams("100.0006"), others, d).has_value());  // 0.3 mg from the mean
  CHECK_FALSE(app::far_from_others(grams("100.0000"), others, d).has_value());  // -0.3 mg
  const auto far = app::far_from_others(grams("100.0008"), others, d);          // 0.5 mg
  REQUIRE(far.has_value());
  CHECK_THAT(*far, Catch::StartsWith("it lies 0.5 mg from the mean of the others"));
  CHECK(app::far_from_others(grams("99.9998"), others, d).has_value());  // -0.5 mg
}

TEST_CASE("the far-reading warning waits for three others and scales with their spread", "[capture]") {
  const ExactMass d = grams("0.0001");
  // Two others: no judgement yet, however far.
  CHECK_FALSE(app::far_from_others(grams("101.0000"), {grams("100.0002"), grams("100.0003")}, d).has_value());
  // Others 100.0000, 100.0010, 100.0020 g: s = 1 mg (deviations -1, 0, +1 mg), limit 4 mg. A reading 2.5 mg
  // from their mean is within it, 4.5 mg is not.
  const std::vector<ExactMass> wide{grams("100.0000"), grams("100.0010"), grams("100.0020")};
  CHECK_FALSE(app::far_from_others(grams("100.0035"), wide, d).has_value());
  CHECK(app::far_from_others(grams("100.0055"), wide, d).has_value());
  // Identical others (s = 0): the readability d is the spread, so one digit off is not "far".
  const std::vector<ExactMass> same{grams("100.0003"), grams("100.0003"), grams("100.0003")};
  CHECK_FALSE(app::far_from_others(grams("100.0004"), same, d).has_value());
  CHECK(app::far_from_others(grams("100.0008"), same, d).has_value());
}
