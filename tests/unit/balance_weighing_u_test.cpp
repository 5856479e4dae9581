// The u of one weighing from a balance's calibration (EURAMET cg-18 U(E) at the calibrated loads): the
// interpolation, the ends and bad input, each worked by hand.
#include <catch2/catch.hpp>

#include "checks/balance_weighing_u.hpp"
#include "core/errors.hpp"
#include "support/margin.hpp"

using Catch::Matchers::Contains;
using plumb::Mass;
using plumb::test::mass_near;
using plumb::test::ug;
namespace ck = plumb::checks;

namespace {
ck::BalanceCalibrationUse calibration() {
  // Invented: U(E) 0.2 mg at 20 g, 0.3 mg at 100 g, 0.5 mg at 200 g, all k = 2 except 2.1 at 100 g.
  ck::BalanceCalibrationUse c;
  c.balance_id = "BAL-9";
  c.run_id = 12;
  c.performed_on = plumb::parse_date("2026-09-14", "date");
  c.loads = {{Mass::grams(100), Mass::milligrams(0.3), 2.1},
             {Mass::grams(20), Mass::milligrams(0.2), 2.0},
             {Mass::grams(200), Mass::milligrams(0.5), 2.0}};
  return c;
}
}  // namespace

TEST_CASE("weighing u from a calibration, worked by hand", "[unit][uncertainty]") {
  const auto c = calibration();
  // At or below the smallest load: its u, 0.2 / 2 = 0.1 mg.
  CHECK_THAT(ck::weighing_uncertainty_at(c, Mass::grams(1)).u, mass_near(Mass::milligrams(0.1), ug(1e-6)));
  CHECK_THAT(ck::weighing_uncertainty_at(c, Mass::grams(20)).u, mass_near(Mass::milligrams(0.1), ug(1e-6)));
  // Between 20 g (u 0.1 mg) and 100 g (u 0.3 / 2.1 = 0.142857143 mg), at 60 g, halfway:
  // 0.1 + 0.5 x 0.042857143 = 0.121428571 mg.
  const auto mid = ck::weighing_uncertainty_at(c, Mass::grams(60));
  CHECK_THAT(mid.u, mass_near(Mass::milligrams(0.1214285714), ug(1e-6)));
  CHECK_THAT(mid.basis, Contains("interpolated at 60 g") && Contains("calibration run 12 of 2026-09-14"));
  // At a calibrated load exactly: its own u, 0.3 / 2.1 = 0.1428571429 mg.
  CHECK_THAT(ck::weighing_uncertainty_at(c, Mass::grams(100)).u, mass_near(Mass::milligrams(0.1428571429), ug(1e-6)));
  // Above the largest (200 g, u 0.25 mg), in proportion: at 210 g, 0.25 x 210 / 200 = 0.2625 mg.
  const auto above = ck::weighing_uncertainty_at(c, Mass::grams(210));
  CHECK_THAT(above.u, mass_near(Mass::milligrams(0.2625), ug(1e-6)));
  CHECK_THAT(above.basis, Contains("scaled in proportion"));
}

TEST_CASE("weighing u from a calibration: bad input", "[unit][uncertainty]") {
  auto c = calibration();
  c.loads.clear();
  CHECK_THROWS_WITH(ck::weighing_uncertainty_at(c, Mass::grams(1)), Contains("states no calibrated load"));
  c = calibration();
  c.loads[1].k = 0.0;
  CHECK_THROWS_AS(ck::weighing_uncertainty_at(c, Mass::grams(1)), plumb::InputError);
}
