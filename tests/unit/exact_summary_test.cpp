#include <catch2/catch.hpp>

#include "core/decimal.hpp"
#include "stats/exact_summary.hpp"

using plumb::Decimal;

TEST_CASE("repeatability SD of large readings is exact", "[stats]") {
  // Large readings with small scatter (a 10 t scale read to 0.1 kg): 10000000.1 / 10000000.3. By hand: mean 10000000.2, deviations +-0.1,
  // SS = 4 x 0.01 = 0.04, s^2 = 0.04 / 3, s = 0.115470053837925 (sqrt(1/75)).
  const std::vector<Decimal> v{Decimal::parse("10000000.1"), Decimal::parse("10000000.3"),
                               Decimal::parse("10000000.1"), Decimal::parse("10000000.3")};
  const auto s = plumb::stats::summarize_exact(v);
  CHECK(s.mean() == 10000000.2);
  CHECK(s.sd() == Approx(0.115470053837925).epsilon(1e-14));
  CHECK(s.mean_minus(Decimal::parse("10000000.15")) == Approx(0.05).epsilon(1e-13));
}

TEST_CASE("mixed scales are aligned exactly", "[stats]") {
  // 1.5 and 2.25: mean 1.875, s = |2.25 - 1.5| / sqrt(2) = 0.530330085889911.
  const std::vector<Decimal> v{Decimal::parse("1.5"), Decimal::parse("2.25")};
  const auto s = plumb::stats::summarize_exact(v);
  CHECK(s.mean() == 1.875);
  CHECK(s.sd() == Approx(0.530330085889911).epsilon(1e-14));
  CHECK(s.min == 1.5);
  CHECK(s.max == 2.25);
}
