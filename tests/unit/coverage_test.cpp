#include <catch2/catch.hpp>

#include <cmath>
#include <limits>

#include "core/errors.hpp"
#include "stats/coverage.hpp"

using namespace plumb::stats;

TEST_CASE("coverage factor: k = 2 exactly in the normal limit at 95.45 %", "[unit][coverage]") {
  // 95.45 % is defined here as 2 Phi(2) - 1, so the normal quantile is 2 to rounding.
  CHECK(coverage_factor(infinite_dof, p_95_45()) == Approx(2.0).epsilon(1e-12));
  // Normal 97.5 % quantile, 1.959964 (any statistics table).
  CHECK(coverage_factor(infinite_dof, 0.95) == Approx(1.959964).epsilon(1e-6));
  // Student's t with 1 dof is Cauchy: t_0.975 = tan(0.475 pi) = 12.7062 (closed form).
  CHECK(coverage_factor(1, 0.95) == Approx(std::tan(0.475 * M_PI)).epsilon(1e-10));
  // t with 2 dof: quantile q = t / sqrt(2 + t^2) solves 2F-1 = p, so t = p sqrt(2 / (1 - p^2)) = 4.3027 at 95 %.
  CHECK(coverage_factor(2, 0.95) == Approx(0.95 * std::sqrt(2.0 / (1 - 0.95 * 0.95))).epsilon(1e-10));
}

TEST_CASE("coverage factor: decreases with dof and accepts fractional dof", "[unit][coverage]") {
  const double k5 = coverage_factor_95_45(5), k5_5 = coverage_factor_95_45(5.5), k6 = coverage_factor_95_45(6);
  CHECK(k5 > k5_5);
  CHECK(k5_5 > k6);
  CHECK(coverage_factor_95_45(1e7) == Approx(2.0).epsilon(1e-6));
}

TEST_CASE("coverage factor: bad input", "[unit][coverage]") {
  CHECK_THROWS_AS(coverage_factor(0, 0.95), plumb::InputError);
  CHECK_THROWS_AS(coverage_factor(-3, 0.95), plumb::InputError);
  CHECK_THROWS_AS(coverage_factor(5, 1.0), plumb::InputError);
  CHECK_THROWS_AS(coverage_factor(5, 0.0), plumb::InputError);
}
