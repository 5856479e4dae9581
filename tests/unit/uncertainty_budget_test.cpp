#include <catch2/catch.hpp>

#include <cmath>

#include "core/errors.hpp"
#include "stats/uncertainty_budget.hpp"
#include "support/margin.hpp"

using namespace plumb::stats;
using plumb::test::grams_near;
using plumb::test::ug;

TEST_CASE("budget: divisors of the distributions (GUM 4.3.7, 4.3.9, F.2.2.1)", "[unit][budget]") {
  // Divisors and unit-free uncertainties of a unit width: to 1e-15 relative (a few ulps).
  CHECK(Contribution::rounding("d", 1.0).standard_uncertainty() == Approx(1.0 / (2.0 * std::sqrt(3.0))).epsilon(1e-15));
  CHECK(Contribution::triangular("t", 1.0).standard_uncertainty() == Approx(1.0 / std::sqrt(6.0)).epsilon(1e-15));
  CHECK(standard_divisor(Distribution::u_shaped) == Approx(std::sqrt(2.0)).epsilon(1e-15));
  CHECK(to_string(Distribution::rounding) == "rounding");
}

TEST_CASE("budget: all Type B gives infinite dof and k = 2, and a fixed k is honoured", "[unit][budget]") {
  // u_c = sqrt(3^2 + 4^2) = 5 g by hand (masses to 1e-5 ug).
  const auto r = combine("x", "g", {Contribution::standard("a", 3.0), Contribution::standard("b", 4.0, -1.0)});
  CHECK_THAT(r.combined, grams_near(5.0, ug(1e-5)));
  CHECK(std::isinf(r.nu_eff));
  CHECK(r.k == Approx(2.0).epsilon(1e-12));
  CHECK_THAT(r.expanded, grams_near(10.0, ug(1e-5)));
  BudgetOptions o;
  o.fixed_k = 2.5;
  const auto f = combine("x", "g", {Contribution::type_a("a", 1.0, 3)}, o);
  CHECK(f.k == 2.5);
  CHECK(f.k_fixed);
  CHECK_THAT(f.expanded, grams_near(2.5, ug(1e-5)));
}

TEST_CASE("budget: bad input names the source", "[unit][budget]") {
  CHECK_THROWS_WITH(combine("x", "g", {Contribution::standard("thermometer", -1.0)}),
                    Catch::Contains("thermometer"));
  CHECK_THROWS_AS(combine("x", "g", {Contribution::type_a("rep", 1.0, 0)}), plumb::InputError);
  CHECK_THROWS_AS(combine("x", "g", {Contribution::expanded("cert", 1.0, 0)}), plumb::InputError);
}
