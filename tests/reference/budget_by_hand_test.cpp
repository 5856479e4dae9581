// Outside check: an uncertainty budget worked by hand on paper (GUM, JCGM 100:2008: root sum of squares,
// Welch-Satterthwaite G.4.1, coverage factor from Table G.2), every contribution checkable with a pencil.
#include <catch2/catch.hpp>

#include <cmath>

#include "stats/uncertainty_budget.hpp"
#include "support/margin.hpp"

using namespace plumb::stats;
using plumb::test::milligrams_near;
using plumb::test::ug;

TEST_CASE("GUM budget worked by hand on paper", "[reference][budget]") {
  // Worked by hand on paper (every line can be checked with a pencil), units mg:
  //   A  repeatability, Type A: u = 0.12, nu = 4                          -> contribution 0.12
  //   B  certificate: U = 0.12 with k = 2 -> u = 0.06; sensitivity 0.5     -> contribution 0.03
  //   C  rectangular, half-width a = 0.04 sqrt 3 = 0.069282032 -> u = 0.04 -> contribution 0.04
  //   u_c^2 = 0.0144 + 0.0009 + 0.0016 = 0.0169, u_c = 0.13
  //   nu_eff = u_c^4 / (u_A^4 / 4) = 0.00028561 / (0.00020736 / 4) = 0.00028561 / 0.00005184 = 5.5094522
  //   truncated to 5 (GUM G.4.1 note 1); GUM Table G.2 at nu = 5, 95.45 %: k = 2.65
  //   U = 2.65 x 0.13 = 0.3445 (to the table's precision of k: +/- 0.005 x 0.13)
  //   shares: A 0.0144 / 0.0169 = 0.8520710, B 0.0009 / 0.0169 = 0.0532544, C 0.0016 / 0.0169 = 0.0946746
  // Every mg value below is held to 1e-10 ug (1e-13 mg): the inputs are exact short decimals.
  std::vector<Contribution> in{
      Contribution::type_a("repeatability", 0.12, 4),
      Contribution::expanded("reference", 0.12, 2.0, 0.5),
      Contribution::rectangular("temperature", 0.04 * std::sqrt(3.0)),
  };
  const auto r = combine("E", "mg", in);
  REQUIRE(r.lines.size() == 3);
  CHECK_THAT(r.lines[0].contribution, milligrams_near(0.12, ug(1e-10)));
  CHECK_THAT(r.lines[1].standard_uncertainty, milligrams_near(0.06, ug(1e-10)));
  CHECK_THAT(r.lines[1].contribution, milligrams_near(0.03, ug(1e-10)));
  CHECK(r.lines[2].input.divisor == Approx(std::sqrt(3.0)).epsilon(1e-15));
  CHECK_THAT(r.lines[2].contribution, milligrams_near(0.04, ug(1e-10)));
  CHECK_THAT(r.combined, milligrams_near(0.13, ug(1e-10)));
  CHECK(r.nu_eff == Approx(5.5094522).margin(1e-7).epsilon(0));
  CHECK(r.dof_used == 5.0);
  CHECK(std::abs(r.k - 2.65) <= 0.005);
  CHECK(std::abs(r.expanded - 0.3445) <= 0.005 * 0.13);
  CHECK(r.lines[0].share == Approx(0.8520710).margin(1e-7).epsilon(0));
  CHECK(r.lines[1].share == Approx(0.0532544).margin(1e-7).epsilon(0));
  CHECK(r.lines[2].share == Approx(0.0946746).margin(1e-7).epsilon(0));
  CHECK(r.statement().find("k = 2.65") != std::string::npos);
}

