// Check-interval review by OIML D 10:2007 / ILAC G24: method 1 (staircase) and the control-chart method.
// Histories and outcomes below are invented and built by hand; the arithmetic is in the comments.
#include <catch2/catch.hpp>

#include "core/errors.hpp"
#include "stats/interval_review.hpp"
#include "support/history.hpp"

using namespace plumb::stats;
using plumb::Interval;
using plumb::parse_date;

namespace {

std::vector<CheckOutcome> outcomes(std::initializer_list<bool> in_tolerance) {
  std::vector<CheckOutcome> out;
  auto d = parse_date("2024-01-01");
  for (bool ok : in_tolerance) {
    out.push_back({d, ok});
    d = plumb::add_days(d, 30);
  }
  return out;
}

bool says(const IntervalRecommendation& r, const std::string& words) {
  for (const auto& s : r.reasoning)
    if (s.find(words) != std::string::npos) return true;
  return false;
}

ControlChartReviewOptions tol(std::optional<double> lower, std::optional<double> upper) {
  ControlChartReviewOptions o;
  o.tolerance = {lower, upper};
  o.unit = "mg";
  return o;
}

}  // namespace

TEST_CASE("staircase: in tolerance lengthens by 1.25, out of tolerance halves", "[stats][interval]") {
  const Interval twelve_weeks{12, Interval::Unit::week};  // 84 days
  SECTION("pass after a fail: 84 * 1.25 = 105 days") {
    const auto r = staircase_review(twelve_weeks, outcomes({true, false, true}));
    CHECK(r.action == IntervalAction::lengthen);
    CHECK(r.current_days == 84);
    CHECK(r.recommended_days == 105);
    CHECK(r.recommended() == Interval{105, Interval::Unit::day});
    CHECK(says(r, "1 such result(s) in a row"));
    CHECK_THAT(r.method, Catch::Contains("OIML D 10") && Catch::Contains("method 1"));
    CHECK(says(r, "medicine, clinical or food"));
  }
  SECTION("fail: 84 * 0.5 = 42 days") {
    const auto r = staircase_review(twelve_weeks, outcomes({true, true, false}));
    CHECK(r.action == IntervalAction::shorten);
    CHECK(r.recommended_days == 42);
    CHECK(says(r, "out of tolerance"));
  }
  SECTION("at the 730-day maximum a pass keeps the interval") {
    const auto r = staircase_review(Interval{730, Interval::Unit::day}, outcomes({true}));
    CHECK(r.action == IntervalAction::keep);
    CHECK(r.recommended_days == 730);
  }
  SECTION("just under the maximum the step is capped: 700 * 1.25 = 875 -> 730") {
    const auto r = staircase_review(Interval{700, Interval::Unit::day}, outcomes({true}));
    CHECK(r.action == IntervalAction::lengthen);
    CHECK(r.recommended_days == 730);
  }
  SECTION("at the 7-day minimum a fail keeps the interval and asks for the cause") {
    const auto r = staircase_review(Interval{7, Interval::Unit::day}, outcomes({false}));
    CHECK(r.action == IntervalAction::keep);
    CHECK(says(r, "find and remove the cause"));
  }
}

TEST_CASE("staircase bad input is one clear sentence", "[stats][interval][errors]") {
  CHECK_THROWS_WITH(staircase_review(Interval{7, Interval::Unit::day}, {}), Catch::Contains("no check outcomes"));
  IntervalSteps bad;
  bad.shorten = 1.5;
  CHECK_THROWS_AS(staircase_review(Interval{7, Interval::Unit::day}, outcomes({true}), bad), plumb::InputError);
  auto backwards = outcomes({true, true});
  backwards[1].date = parse_date("2023-01-01");
  CHECK_THROWS_WITH(staircase_review(Interval{7, Interval::Unit::day}, backwards), Catch::Contains("outcome 2"));
}

TEST_CASE("control-chart method: stable and far from the limits lengthens", "[stats][interval]") {
  // 12 results alternating +0.1 / -0.1 mg every 10 days, tolerance +/-1 mg. Chart: centre 0, MR 0.2,
  // sigma 0.177, every point at 0.56 sigma: no rule. Drift: Sxy = -6 mg.d, Sxx = 14300 d^2, slope -0.00042
  // mg/d; the prediction bound stays near +/-0.45 mg, inside +/-1 up to the horizon (110 days after the
  // last check). 28 days * 1.25 = 35 days.
  const auto h = plumb::test::weekly({0.1, -0.1, 0.1, -0.1, 0.1, -0.1, 0.1, -0.1, 0.1, -0.1, 0.1, -0.1}, 0.05,
                                     "2024-01-01", 10);
  const auto r = control_chart_review(Interval{4, Interval::Unit::week}, h, tol(-1.0, 1.0));
  CHECK(r.action == IntervalAction::lengthen);
  CHECK(r.recommended_days == 35);
  CHECK(says(r, "no Western Electric rule is broken"));
  CHECK(says(r, "beyond which plumb does not project"));
}

TEST_CASE("control-chart method: drift towards a limit shortens or keeps", "[stats][interval]") {
  // The hand-worked drift history (drift_test.cpp): d = 0..40 step 10, y = 1.0, 1.2, 1.1, 1.5, 1.4 mg,
  // P(d) = 1.02 + 0.011 d + 0.414938 sqrt(1.2 + (d - 20)^2 / 1000). Upper limit 2.5:
  // P(65) = 1.735 + 0.414938 * 1.79583 = 2.48016 < 2.5; P(66) = 1.746 + 0.414938 * 1.82099 = 2.50160
  // -> day 66, 26 days after the last check (day 40). No Western Electric rule: z = -1.35, -0.23, -0.79,
  // 1.47, 0.90 with sigma = 0.2 / 1.128.
  const auto h = plumb::test::weekly({1.0, 1.2, 1.1, 1.5, 1.4}, 0.1, "2024-01-01", 10);
  SECTION("current 28 days ends after the projected date: shorten to 26") {
    const auto r = control_chart_review(Interval{28, Interval::Unit::day}, h, tol(std::nullopt, 2.5));
    CHECK(r.action == IntervalAction::shorten);
    CHECK(r.recommended_days == 26);
    CHECK(says(r, "2024-03-07 (extrapolation), 26 days after the last check"));  // 2024-01-01 + 66 days
  }
  SECTION("current 24 days ends before it, but 24 * 1.25 = 30 would not: keep") {
    const auto r = control_chart_review(Interval{24, Interval::Unit::day}, h, tol(std::nullopt, 2.5));
    CHECK(r.action == IntervalAction::keep);
    CHECK(r.recommended_days == 24);
  }
  SECTION("current 14 days: 14 * 1.25 = 17.5 -> 18 days, still before day 26: lengthen") {
    const auto r = control_chart_review(Interval{14, Interval::Unit::day}, h, tol(std::nullopt, 2.5));
    CHECK(r.action == IntervalAction::lengthen);
    CHECK(r.recommended_days == 18);
  }
}

TEST_CASE("control-chart method: a recent Western Electric signal or a result out of tolerance shortens",
          "[stats][interval]") {
  SECTION("rule 1 on the last check: 28 * 0.5 = 14 days") {
    // 20 points alternating +/-0.564 (centre 0, sigma 1), then 3.5: beyond the upper control limit 3.
    std::vector<Observation> h;
    for (int i = 0; i < 20; ++i) h = plumb::test::concat(h, {i % 2 == 0 ? 0.564 : -0.564});
    h = plumb::test::concat(h, {3.5});
    const auto r = control_chart_review(Interval{28, Interval::Unit::day}, h, tol(-10.0, 10.0));
    CHECK(r.action == IntervalAction::shorten);
    CHECK(r.recommended_days == 14);
    CHECK(says(r, "rule 1"));
  }
  SECTION("last result above the upper limit") {
    const auto h = plumb::test::weekly({0.1, 0.2, 0.15, 0.6});
    const auto r = control_chart_review(Interval{28, Interval::Unit::day}, h, tol(-0.5, 0.5));
    CHECK(r.action == IntervalAction::shorten);
    CHECK(says(r, "out of tolerance"));
  }
  SECTION("too few results: keep, saying why") {
    const auto r = control_chart_review(Interval{28, Interval::Unit::day}, plumb::test::weekly({0.1, 0.2}),
                                        tol(-0.5, 0.5));
    CHECK(r.action == IntervalAction::keep);
    CHECK(says(r, "Only 2 result(s)"));
  }
}
