#include <catch2/catch.hpp>

#include "checks/decision_rule.hpp"
#include "core/errors.hpp"
#include "support/margin.hpp"

using namespace plumb::checks;
using plumb::Mass;
using plumb::test::mass_near;
using plumb::test::ug;

namespace {
// The errors, uncertainties and limits of these cases are masses in mg (a balance's error of indication).
Mass mg(double v) {
  return Mass::milligrams(v);
}
}  // namespace

TEST_CASE("simple acceptance: inside passes, outside fails, the limit itself passes", "[unit][decision]") {
  const auto lim = Limits::symmetric(mg(1.0));
  CHECK(decide(mg(0.9), mg(0.5), lim, DecisionRule::simple_acceptance).state == Conformity::pass);
  CHECK(decide(mg(1.0), mg(0.5), lim, DecisionRule::simple_acceptance).state == Conformity::pass);
  CHECK(decide(mg(-1.1), mg(0.5), lim, DecisionRule::simple_acceptance).state == Conformity::fail);
  CHECK(decide(mg(0.9), mg(0.5), lim, DecisionRule::simple_acceptance).guard_band == Mass());
}

TEST_CASE("guard band w = U: each of the four states, built by hand", "[unit][decision]") {
  // Tolerance +/- 1.0 mg, U = 0.3 mg: acceptance zone [-0.7, 0.7]; clear fail beyond +/- 1.3.
  const auto lim = Limits::symmetric(mg(1.0));
  const auto gb = DecisionRule::guard_band_u;
  const auto pass = decide(mg(0.5), mg(0.3), lim, gb);
  CHECK(pass.state == Conformity::pass);
  CHECK_THAT(*pass.acceptance_upper, mass_near(mg(0.7), ug(1e-6)));  // 1.0 mg - 0.3 mg
  CHECK_THAT(*pass.acceptance_lower, mass_near(mg(-0.7), ug(1e-6)));
  CHECK(decide(mg(0.7), mg(0.25), lim, gb).state == Conformity::pass);            // 0.7 + 0.25 = 0.95 <= 1.0
  CHECK(decide(mg(0.8), mg(0.3), lim, gb).state == Conformity::pass_not_proven);  // 0.8 + 0.3 = 1.1 > 1.0
  CHECK(decide(mg(-0.9), mg(0.3), lim, gb).state == Conformity::pass_not_proven);
  CHECK(decide(mg(1.2), mg(0.3), lim, gb).state == Conformity::fail_not_proven);  // 1.2 - 0.3 = 0.9 < 1.0
  CHECK(decide(mg(-1.1), mg(0.3), lim, gb).state == Conformity::fail_not_proven);
  CHECK(decide(mg(1.4), mg(0.3), lim, gb).state == Conformity::fail);  // 1.4 - 0.3 = 1.1 > 1.0
  CHECK(decide(mg(-2.0), mg(0.3), lim, gb).state == Conformity::fail);
  // The same results under simple acceptance are a plain pass or fail.
  CHECK(decide(mg(0.8), mg(0.3), lim, DecisionRule::simple_acceptance).state == Conformity::pass);
  CHECK(decide(mg(1.2), mg(0.3), lim, DecisionRule::simple_acceptance).state == Conformity::fail);
}

TEST_CASE("guard band wider than half the tolerance: nothing can clearly pass", "[unit][decision]") {
  const auto d = decide(mg(0.0), mg(1.5), Limits::symmetric(mg(1.0)), DecisionRule::guard_band_u);
  CHECK(d.acceptance_zone_empty);
  CHECK(d.state == Conformity::pass_not_proven);
  CHECK(d.explanation.find("no result can clearly pass") != std::string::npos);
}

TEST_CASE("one-sided limits and names", "[unit][decision]") {
  Limits upper_only{std::nullopt, mg(2.0)};
  CHECK(decide(mg(-100.0), mg(0.5), upper_only, DecisionRule::guard_band_u).state == Conformity::pass);
  CHECK(decide(mg(1.8), mg(0.5), upper_only, DecisionRule::guard_band_u).state == Conformity::pass_not_proven);
  CHECK(to_string(Conformity::pass_not_proven) == "pass, not proven");
  CHECK(to_string(Conformity::fail_not_proven) == "fail, not proven");
  CHECK(key(Conformity::fail_not_proven) == "fail-not-proven");
  CHECK(parse_decision_rule("guard-band") == DecisionRule::guard_band_u);
  CHECK(parse_decision_rule("Simple acceptance") == DecisionRule::simple_acceptance);
  CHECK(rule_statement(DecisionRule::guard_band_u).find("ILAC G8:09/2019") != std::string::npos);
  CHECK_THROWS_WITH(parse_decision_rule("majority vote", "decision rule of B-1"), Catch::Contains("B-1"));
  CHECK_THROWS_AS(decide(mg(0), mg(-1), upper_only, DecisionRule::guard_band_u), plumb::InputError);
  CHECK_THROWS_AS(decide(mg(0), mg(1), Limits{}, DecisionRule::guard_band_u), plumb::InputError);
  CHECK_THROWS_AS(decide(mg(0), mg(1), Limits{mg(2.0), mg(1.0)}, DecisionRule::guard_band_u), plumb::InputError);
}

TEST_CASE("beyond_limit: a magnitude on its limit is not beyond it, the next printed digit is", "[unit][decision]") {
  // ILAC G8:09/2019 simple acceptance: a result exactly on the limit passes.
  CHECK_FALSE(beyond_limit(0.8, 0.8));
  CHECK_FALSE(beyond_limit(0.8 * (1 + 1e-12), 0.8));  // the same value through the Z factor, off by rounding
  CHECK(beyond_limit(0.8001, 0.8));                   // one digit past the limit as printed to 4 decimals
  CHECK_FALSE(beyond_limit(0.7999, 0.8));
}
