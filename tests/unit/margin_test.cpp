// The margin helpers themselves (tests/support/margin.hpp): each must pass a value inside its margin, fail one
// just outside, refuse a margin that could not tell the expected value from zero, and say why with units.
#include <catch2/catch.hpp>

#include "support/margin.hpp"

using namespace plumb::test;
using plumb::Mass;
using plumb::Volume;

TEST_CASE("grams_near: inside passes, just outside fails, the message names both values and the margin",
          "[unit][margin]") {
  // 100.00023 g against a margin of 0.001 mg (1e-6 g): 100.0002305 g is 0.0005 mg off, 100.0002320 g is 0.002 mg off.
  const auto m = grams_near(100.00023, mg(0.001));
  CHECK(m.match(100.0002305));
  CHECK(m.match(100.00023));
  CHECK_FALSE(m.match(100.0002320));
  CHECK_FALSE(m.match(100.0002280));
  const std::string why = m.describe();  // after the failing match above
  CHECK_THAT(why, Catch::Contains("100.00023 g") && Catch::Contains("0.001 mg") && Catch::Contains("100.000228 g"));
  CHECK_FALSE(grams_near(1.0, mg(1)).match(std::nan("")));
}

TEST_CASE("a margin as wide as the expected value is refused, not passed", "[unit][margin]") {
  // Expecting a bias of 0.2 mg with a margin of 0.2 mg would pass a bias of zero: the comparison fails.
  const auto loose = grams_near(0.0002, mg(0.2));
  CHECK_FALSE(loose.match(0.0002));
  CHECK_THAT(loose.describe(), Catch::Contains("not smaller than the expected"));
  CHECK_FALSE(grams_near(0.0002, mg(-0.001)).match(0.0002));
  // An expected zero takes any margin (a residual that must vanish).
  CHECK(grams_near(0.0, ug(1)).match(5e-7));
  CHECK_FALSE(grams_near(0.0, ug(1)).match(2e-6));
}

TEST_CASE("within_fraction_of_d, milligrams, masses, volumes and percentages", "[unit][margin]") {
  // d = 0.1 mg, d/100 = 0.001 mg = 1e-6 g.
  const auto d100 = within_fraction_of_d(100.00023, mg(0.1), 100);
  CHECK(d100.match(100.0002309));
  CHECK_FALSE(d100.match(100.0002311));
  CHECK_THAT(d100.describe(), Catch::Contains("d/100"));
  CHECK(milligrams_near(0.2, ug(1)).match(0.2009));
  CHECK_FALSE(milligrams_near(0.2, ug(1)).match(0.2011));
  CHECK(mass_near(Mass::milligrams(0.2), ug(1)).match(Mass::grams(0.0002009)));
  CHECK_FALSE(mass_near(Mass::milligrams(0.2), ug(1)).match(Mass::grams(0.0002011)));
  CHECK(microlitres_near(100.01532, ul(0.000005)).match(100.015324));
  CHECK_FALSE(microlitres_near(100.01532, ul(0.000005)).match(100.015326));
  CHECK(volume_near(Volume::microlitres(0.8), ul(1e-9)).match(Volume::microlitres(0.8)));
  CHECK_FALSE(volume_near(Volume::microlitres(0.8), ul(1e-9)).match(Volume::millilitres(0.0008) + ul(2e-9)));
  CHECK(percent_near(0.0002, pp(1e-9)).match(0.0002000005));
  CHECK_FALSE(percent_near(0.0002, pp(1e-9)).match(0.000200002));
  CHECK_THAT(percent_near(0.0002, pp(1e-9)).describe(), Catch::Contains("percentage points"));
}
