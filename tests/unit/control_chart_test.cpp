// Individuals chart and the four Western Electric rules (Western Electric Statistical Quality Control
// Handbook, 1956; the rules as usually stated: 1 point beyond 3 sigma; 2 of 3 beyond 2 sigma on one side;
// 4 of 5 beyond 1 sigma on one side; 8 in a row on one side). Every sequence below was built by hand.
//
// Most cases share a hand-built baseline of four points +0.564, -0.564, +0.564, -0.564:
//   centre = 0, each moving range = 1.128, MRbar = 1.128, sigma = MRbar / 1.128 = 1,
//   so the lines are at +/-1, +/-2, +/-3 and a value reads directly in sigmas.
// Test values keep at least 0.01 sigma away from a line so rounding cannot decide a case.
#include <catch2/catch.hpp>

#include "core/errors.hpp"
#include "stats/control_chart.hpp"
#include "support/history.hpp"

using namespace plumb::stats;
using plumb::test::concat;
using plumb::test::weekly;

namespace {

const ControlChartOptions first_four{Baseline{0, 4}, "mg"};

std::vector<Observation> unit_baseline_then(std::initializer_list<double> more) {
  return concat(weekly({0.564, -0.564, 0.564, -0.564}), more);
}

std::vector<RuleFlag> flags_of(const ControlChart& c, WesternElectricRule r) {
  std::vector<RuleFlag> out;
  for (const auto& f : c.flags)
    if (f.rule == r) out.push_back(f);
  return out;
}

using Idx = std::vector<std::size_t>;

}  // namespace

TEST_CASE("individuals chart limits from the moving range, worked by hand", "[stats][control]") {
  // Values 10, 12, 11, 15, 13 (invented). Mean = 61 / 5 = 12.2.
  // Moving ranges 2, 1, 4, 2 -> MRbar = 9 / 4 = 2.25; sigma = 2.25 / 1.128 = 1.99468085...
  // UCL = 12.2 + 3 * 1.99468085 = 18.18404255; LCL = 12.2 - 5.98404255 = 6.21595745.
  const auto h = weekly({10, 12, 11, 15, 13});
  const auto c = individuals_chart(h);
  CHECK(c.limits.centre == Approx(12.2).epsilon(1e-12));
  CHECK(c.limits.average_moving_range == Approx(2.25).epsilon(1e-12));
  CHECK(c.limits.sigma == Approx(1.99468085106383).epsilon(1e-12));
  CHECK(c.limits.ucl() == Approx(18.18404255319149).epsilon(1e-12));
  CHECK(c.limits.lcl() == Approx(6.21595744680851).epsilon(1e-12));
  CHECK(c.limits.baseline_count == 5);  // fewer than 20 results: all form the baseline ...
  REQUIRE(c.notes.size() == 1);         // ... and the chart says so
  CHECK_THAT(c.notes[0], Catch::Contains("Only 5 results"));
  CHECK_THAT(c.method, Catch::Contains("1.128"));
  CHECK(c.in_control());
  // Zones by hand: (15 - 12.2) / 1.99468 = 1.40 -> B; (10 - 12.2) / 1.99468 = -1.10 -> B; 12 -> C.
  CHECK(c.zones[3] == Zone::b);
  CHECK(c.zones[0] == Zone::b);
  CHECK(c.zones[1] == Zone::c);
}

TEST_CASE("default baseline is the first 20 points, later points do not move the limits", "[stats][control]") {
  // 20 alternating +/-0.564 (centre 0, sigma 1 by the construction above), then 5 and 0.5.
  std::vector<Observation> h;
  for (int i = 0; i < 20; ++i) h = concat(h, {i % 2 == 0 ? 0.564 : -0.564});
  h = concat(h, {5.0, 0.5});
  const auto c = individuals_chart(h);
  CHECK(c.limits.baseline_first == 0);
  CHECK(c.limits.baseline_count == 20);
  CHECK(c.limits.centre == Approx(0.0).margin(1e-12).epsilon(0));
  CHECK(c.limits.sigma == Approx(1.0).epsilon(1e-12));
  CHECK(c.notes.empty());
  const auto r1 = flags_of(c, WesternElectricRule::one_beyond_3_sigma);
  REQUIRE(r1.size() == 1);
  CHECK(r1[0].indices == Idx{20});
  CHECK(c.zones[20] == Zone::beyond);
}

TEST_CASE("a user-chosen baseline range sets the limits", "[stats][control]") {
  // Points 1-3 are a disturbed start-up (100, 100, 100.5); the baseline is points 4-7 (0-based 3..6):
  // +0.564, -0.564, +0.564, -0.564 -> centre 0, sigma 1.
  const auto h = concat(weekly({100, 100, 100.5}), {0.564, -0.564, 0.564, -0.564, 0.5});
  const auto c = individuals_chart(h, {Baseline{3, 4}, "mg"});
  CHECK(c.limits.centre == Approx(0.0).margin(1e-12).epsilon(0));
  CHECK(c.limits.sigma == Approx(1.0).epsilon(1e-12));
  CHECK_THAT(c.method, Catch::Contains("checks 4 to 7"));
  // The start-up points are 100 sigma away: rule 1 flags each of them.
  CHECK(flags_of(c, WesternElectricRule::one_beyond_3_sigma).size() == 3);
}

TEST_CASE("Western Electric rule 1: one point beyond 3 sigma", "[stats][control][western-electric]") {
  SECTION("3.5 sigma above triggers, naming the check, its date and the rule") {
    const auto c = individuals_chart(unit_baseline_then({0.3, 3.5, 0.2}), first_four);
    const auto f = flags_of(c, WesternElectricRule::one_beyond_3_sigma);
    REQUIRE(f.size() == 1);
    CHECK(f[0].indices == Idx{5});
    CHECK(f[0].side == Side::above);
    // 2024-01-01 + 5 weeks = 2024-02-05.
    CHECK_THAT(f[0].explanation, Catch::Contains("Check 6 (2024-02-05)"));
    CHECK_THAT(f[0].explanation, Catch::Contains("upper control limit"));
    CHECK_THAT(f[0].explanation, Catch::Contains("rule 1"));
    CHECK_THAT(f[0].explanation, Catch::Contains("mg"));
  }
  SECTION("-3.2 sigma below triggers on the low side") {
    const auto c = individuals_chart(unit_baseline_then({-3.2}), first_four);
    const auto f = flags_of(c, WesternElectricRule::one_beyond_3_sigma);
    REQUIRE(f.size() == 1);
    CHECK(f[0].side == Side::below);
  }
  SECTION("2.99 and -2.99 sigma stay inside the limits: no rule 1") {
    const auto c = individuals_chart(unit_baseline_then({2.99, 0.1, -2.99}), first_four);
    CHECK(flags_of(c, WesternElectricRule::one_beyond_3_sigma).empty());
    CHECK(c.zones[4] == Zone::a);
  }
}

TEST_CASE("Western Electric rule 2: 2 of 3 beyond 2 sigma on one side", "[stats][control][western-electric]") {
  SECTION("2.5, 0.5, 2.5 triggers at the third point with the two outer points") {
    const auto c = individuals_chart(unit_baseline_then({2.5, 0.5, 2.5}), first_four);
    const auto f = flags_of(c, WesternElectricRule::two_of_three_beyond_2_sigma);
    REQUIRE(f.size() == 1);
    CHECK(f[0].indices == Idx{4, 6});
    CHECK(f[0].side == Side::above);
    CHECK_THAT(f[0].explanation, Catch::Contains("2 of 3"));
    CHECK(flags_of(c, WesternElectricRule::one_beyond_3_sigma).empty());
    CHECK(flags_of(c, WesternElectricRule::four_of_five_beyond_1_sigma).empty());  // only 2 beyond 1 sigma
  }
  SECTION("-2.2, -2.4 below triggers on the low side") {
    const auto c = individuals_chart(unit_baseline_then({-2.2, -2.4}), first_four);
    const auto f = flags_of(c, WesternElectricRule::two_of_three_beyond_2_sigma);
    REQUIRE(f.size() == 1);
    CHECK(f[0].side == Side::below);
    CHECK(f[0].indices == Idx{4, 5});
  }
  SECTION("a sustained shift 2.5, 2.5, 0.5, 2.5, 2.5 is one episode, not one flag per completing point") {
    // Windows completing at 0-based 5, 7 and 8 all trigger and overlap: one flag with points 4, 5, 7, 8.
    const auto c = individuals_chart(unit_baseline_then({2.5, 2.5, 0.5, 2.5, 2.5}), first_four);
    const auto f = flags_of(c, WesternElectricRule::two_of_three_beyond_2_sigma);
    REQUIRE(f.size() == 1);
    CHECK(f[0].indices == Idx{4, 5, 7, 8});
  }
  SECTION("two excursions far apart are two flags") {
    const auto c = individuals_chart(unit_baseline_then({2.5, 2.5, 0.1, -0.1, 0.1, -0.1, 2.5, 2.5}), first_four);
    const auto f = flags_of(c, WesternElectricRule::two_of_three_beyond_2_sigma);
    REQUIRE(f.size() == 2);
    CHECK(f[0].indices == Idx{4, 5});
    CHECK(f[1].indices == Idx{10, 11});
  }
  SECTION("2.5, 0.5, -2.5: beyond 2 sigma but on opposite sides, must not trigger") {
    const auto c = individuals_chart(unit_baseline_then({2.5, 0.5, -2.5}), first_four);
    CHECK(flags_of(c, WesternElectricRule::two_of_three_beyond_2_sigma).empty());
  }
  SECTION("2.5, 0.5, 0.5, 2.5: the two are 4 apart, not within 3, must not trigger") {
    const auto c = individuals_chart(unit_baseline_then({2.5, 0.5, 0.5, 2.5}), first_four);
    CHECK(flags_of(c, WesternElectricRule::two_of_three_beyond_2_sigma).empty());
  }
  SECTION("1.99, 1.99, 1.99: inside 2 sigma, must not trigger") {
    const auto c = individuals_chart(unit_baseline_then({1.99, 1.99, 1.99}), first_four);
    CHECK(flags_of(c, WesternElectricRule::two_of_three_beyond_2_sigma).empty());
  }
}

TEST_CASE("Western Electric rule 3: 4 of 5 beyond 1 sigma on one side", "[stats][control][western-electric]") {
  SECTION("1.5, 1.5, 0.5, 1.5, 1.5 triggers at the fifth point") {
    const auto c = individuals_chart(unit_baseline_then({1.5, 1.5, 0.5, 1.5, 1.5}), first_four);
    const auto f = flags_of(c, WesternElectricRule::four_of_five_beyond_1_sigma);
    REQUIRE(f.size() == 1);
    CHECK(f[0].indices == Idx{4, 5, 7, 8});
    CHECK(f[0].side == Side::above);
    CHECK(flags_of(c, WesternElectricRule::two_of_three_beyond_2_sigma).empty());
    CHECK(flags_of(c, WesternElectricRule::eight_on_one_side).empty());  // run of 5 only
  }
  SECTION("-1.2, -1.2, -1.2, -1.2 below triggers at the fourth (window includes a baseline point)") {
    // Window ending at 0-based 7 is [3..7] = -0.564, -1.2, -1.2, -1.2, -1.2: four beyond -1 sigma.
    const auto c = individuals_chart(unit_baseline_then({-1.2, -1.2, -1.2, -1.2}), first_four);
    const auto f = flags_of(c, WesternElectricRule::four_of_five_beyond_1_sigma);
    REQUIRE(f.size() == 1);
    CHECK(f[0].indices == Idx{4, 5, 6, 7});
    CHECK(f[0].side == Side::below);
  }
  SECTION("1.5, 1.5, 0.5, 1.5, 0.5: only 3 of 5 beyond 1 sigma, must not trigger") {
    const auto c = individuals_chart(unit_baseline_then({1.5, 1.5, 0.5, 1.5, 0.5}), first_four);
    CHECK(flags_of(c, WesternElectricRule::four_of_five_beyond_1_sigma).empty());
  }
  SECTION("1.5, -1.5, 1.5, -1.5, 1.5: beyond 1 sigma but alternating sides, must not trigger") {
    const auto c = individuals_chart(unit_baseline_then({1.5, -1.5, 1.5, -1.5, 1.5}), first_four);
    CHECK(flags_of(c, WesternElectricRule::four_of_five_beyond_1_sigma).empty());
  }
}

TEST_CASE("Western Electric rule 4: 8 in a row on one side of the centre", "[stats][control][western-electric]") {
  SECTION("eight points at +0.2 trigger once, listing the whole run") {
    const auto c = individuals_chart(unit_baseline_then({0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2}), first_four);
    const auto f = flags_of(c, WesternElectricRule::eight_on_one_side);
    REQUIRE(f.size() == 1);
    CHECK(f[0].indices == Idx{4, 5, 6, 7, 8, 9, 10, 11});
    CHECK_THAT(f[0].explanation, Catch::Contains("8 checks in a row"));
    CHECK(c.flags.size() == 1);  // nothing else: every point is in zone C
  }
  SECTION("ten in a row below give one flag of ten points") {
    const auto c = individuals_chart(
        unit_baseline_then({-0.1, -0.1, -0.1, -0.1, -0.1, -0.1, -0.1, -0.1, -0.1, -0.1}), first_four);
    const auto f = flags_of(c, WesternElectricRule::eight_on_one_side);
    REQUIRE(f.size() == 1);
    CHECK(f[0].indices.size() == 11);  // the baseline's last point (-0.564) is below too: 11 in a row
    CHECK(f[0].side == Side::below);
  }
  SECTION("seven above then one below: must not trigger") {
    const auto c = individuals_chart(unit_baseline_then({0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, -0.2, 0.2}), first_four);
    CHECK(flags_of(c, WesternElectricRule::eight_on_one_side).empty());
  }
  SECTION("a point exactly on the centre line breaks the run: must not trigger") {
    const auto c =
        individuals_chart(unit_baseline_then({0.2, 0.2, 0.2, 0.2, 0.0, 0.2, 0.2, 0.2, 0.2}), first_four);
    CHECK(flags_of(c, WesternElectricRule::eight_on_one_side).empty());
  }
}

TEST_CASE("a stable alternating history raises no flag at all", "[stats][control][western-electric]") {
  const auto c = individuals_chart(unit_baseline_then({0.9, -0.9, 1.9, -1.9, 0.5, -0.5, 2.9, -2.9}), first_four);
  CHECK(c.in_control());
  CHECK(c.flagged_indices().empty());
}

TEST_CASE("control chart bad input is one clear sentence", "[stats][control][errors]") {
  const auto h = weekly({1, 2, 3});
  CHECK_THROWS_WITH(individuals_chart(h, {Baseline{2, 4}, ""}), Catch::Contains("baseline points 3 to 6"));
  CHECK_THROWS_WITH(individuals_chart(h, {Baseline{0, 1}, ""}), Catch::Contains("baseline count 1"));
  CHECK_THROWS_AS(individuals_chart(weekly({1})), plumb::InputError);
  CHECK_THROWS_WITH(individuals_chart(weekly({2, 2, 2})), Catch::Contains("all have the value 2"));
  auto backwards = weekly({1, 2, 3});
  backwards[2].date = plumb::parse_date("2023-01-01");
  CHECK_THROWS_WITH(individuals_chart(backwards), Catch::Contains("result 3 is dated 2023-01-01"));
  auto nan = weekly({1, 2, 3});
  nan[1].value = std::nan("");
  CHECK_THROWS_WITH(individuals_chart(nan), Catch::Contains("result 2"));
}
