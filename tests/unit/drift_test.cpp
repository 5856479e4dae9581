// Drift line, prediction interval and projected date of reaching a tolerance limit, checked against an
// example worked by hand from the textbook least-squares formulas (b1 = Sxy / Sxx, b0 = ybar - b1 xbar,
// s^2 = SSE / (n - 2), se_pred(x) = s sqrt(1 + 1/n + (x - xbar)^2 / Sxx)).
//
// Invented history: checks every 10 days from 2024-01-01, results (mg) at d = 0, 10, 20, 30, 40:
//   y = 1.0, 1.2, 1.1, 1.5, 1.4
//   xbar = 20, Sxx = 400 + 100 + 0 + 100 + 400 = 1000, ybar = 6.2 / 5 = 1.24
//   Sxy = (-20)(-0.24) + (-10)(-0.04) + 0 + (10)(0.26) + (20)(0.16) = 4.8 + 0.4 + 2.6 + 3.2 = 11.0
//   b1 = 0.011 mg/day, b0 = 1.24 - 0.011 * 20 = 1.02
//   fitted 1.02, 1.13, 1.24, 1.35, 1.46; residuals -0.02, 0.07, -0.14, 0.15, -0.06
//   SSE = 0.0004 + 0.0049 + 0.0196 + 0.0225 + 0.0036 = 0.051; SST = 0.172
//   R^2 = 1 - 0.051 / 0.172 = 0.703488; RMSE = sqrt(0.051 / 5) = 0.100995; s = sqrt(0.017) = 0.130384
//   t(0.975, 3 dof) = 3.1824 (Student t table); t s = 0.414938
//   upper 95 % prediction bound P(d) = 1.02 + 0.011 d + 0.414938 sqrt(1.2 + (d - 20)^2 / 1000)
#include <catch2/catch.hpp>

#include "core/errors.hpp"
#include "stats/drift.hpp"
#include "support/history.hpp"
#include "support/margin.hpp"

using namespace plumb::stats;
using plumb::parse_date;
using plumb::test::milligrams_near;
using plumb::test::ug;

namespace {

std::vector<Observation> worked(double u = 0.0) {
  return plumb::test::weekly({1.0, 1.2, 1.1, 1.5, 1.4}, u, "2024-01-01", 10);
}

DriftOptions upper(double limit) {
  DriftOptions o;
  o.tolerance.upper = limit;
  o.unit = "mg";
  return o;
}

}  // namespace

TEST_CASE("drift line, R^2, RMSE and prediction interval match the hand-worked example", "[stats][drift]") {
  const auto r = analyse_drift(worked(), upper(2.0));
  REQUIRE(r.fit);
  CHECK(r.fit->coef[1] == Approx(0.011).epsilon(1e-12));
  CHECK_THAT(r.fit->coef[0], milligrams_near(1.02, ug(1e-9)));  // intercept, mg
  CHECK(r.fit->r_squared == Approx(0.703488).epsilon(1e-5));
  CHECK_THAT(r.fit->rmse, milligrams_near(0.10099504938, ug(1e-5)));  // sqrt(0.051 / 5) = 0.10099504938 mg
  CHECK(r.t_quantile == Approx(3.1824).epsilon(1e-4));
  CHECK(r.span_days == 40);
  // At d = 40: 1.46 +/- 0.414938 * sqrt(1.2 + 0.4) = 1.46 +/- 0.524860.
  const auto b = r.band(40);
  // The bounds carry the 5 digits of the tabled t: within 0.01 ug (1e-5 mg) of the hand values.
  CHECK_THAT(b.fitted, milligrams_near(1.46, ug(1e-9)));
  CHECK_THAT(b.upper, milligrams_near(1.984860, ug(0.01)));
  CHECK_THAT(b.lower, milligrams_near(0.935140, ug(0.01)));
  CHECK(r.equation() == "y = 0.011 d + 1.02");
  // Slope test: se(b1) = s / sqrt(Sxx) = 0.0041231, t = 2.668; with 3 dof the table gives t = 2.353 at
  // p = 0.10 and 3.182 at p = 0.05, so 0.05 < p < 0.10: not significant.
  CHECK(r.slope_p_value > 0.05);
  CHECK(r.slope_p_value < 0.10);
  CHECK_FALSE(r.slope_significant);
}

TEST_CASE("prediction bound reaching the upper limit after the last check is extrapolation", "[stats][drift]") {
  // Limit 2.0: P(40) = 1.98486 < 2; P(41) = 1.471 + 0.414938 sqrt(1.641) = 2.00254 >= 2 -> day 41,
  // 2024-01-01 + 41 days = 2024-02-11, one day after the last check: extrapolation.
  const auto r = analyse_drift(worked(), upper(2.0));
  CHECK(r.status == DriftStatus::reaches_limit);
  REQUIRE(r.reached);
  CHECK(r.reached->upper);
  CHECK(r.reached->day == 41);
  CHECK(r.reached->date == parse_date("2024-02-11"));
  CHECK(r.reached->extent == Extent::extrapolation);
  // Horizon: span 40 days past the last check: day 80 = 2024-03-21 (2024 is a leap year).
  CHECK(r.horizon == parse_date("2024-03-21"));
  // The line alone reaches 2.0 at d = 89.09 -> day 90, beyond the horizon: not projected.
  CHECK_FALSE(r.trend_reaches);
  bool marked = false;
  for (const auto& s : r.explanation) marked = marked || s.find("2024-02-11 (extrapolation") != std::string::npos;
  CHECK(marked);
}

TEST_CASE("prediction bound reaching the limit inside the observed span is interpolation", "[stats][drift]") {
  // Limit 1.7: P(20) = 1.24 + 0.414938 sqrt(1.2) = 1.69454 < 1.7; P(21) = 1.251 + 0.414938 sqrt(1.201)
  // = 1.70573 >= 1.7 (P rises on 0..20: its slope at d = 0 is 0.011 - 0.414938 * 0.02 / 1.2649 > 0).
  const auto r = analyse_drift(worked(), upper(1.7));
  REQUIRE(r.reached);
  CHECK(r.reached->day == 21);
  CHECK(r.reached->date == parse_date("2024-01-22"));
  CHECK(r.reached->extent == Extent::interpolation);
}

TEST_CASE("trend plus the latest expanded uncertainty as the criterion", "[stats][drift]") {
  // U = 0.15: 1.02 + 0.011 d + 0.15 >= 2.0 -> d >= 75.45 -> day 76 (1.999+... : d = 75 gives 1.995, d = 76
  // gives 2.006) = 2024-03-17, inside the 80-day horizon, extrapolation.
  auto o = upper(2.0);
  o.criterion = DriftCriterion::trend_plus_uncertainty;
  const auto r = analyse_drift(worked(0.15), o);
  CHECK(r.uncertainty_used == 0.15);
  REQUIRE(r.reached);
  CHECK(r.reached->day == 76);
  CHECK(r.reached->date == parse_date("2024-03-17"));
  CHECK(r.reached->extent == Extent::extrapolation);
}

TEST_CASE("a lower limit is reached by a falling result (mirror of the worked example)", "[stats][drift]") {
  auto h = worked();
  for (auto& ob : h) ob.value = -ob.value;
  DriftOptions o;
  o.tolerance.lower = -2.0;
  o.tolerance.upper = 5.0;  // far away on the other side: must not be chosen
  const auto r = analyse_drift(h, o);
  REQUIRE(r.reached);
  CHECK_FALSE(r.reached->upper);
  CHECK(r.reached->day == 41);
}

TEST_CASE("beyond the horizon plumb refuses to project and says why", "[stats][drift]") {
  // Limit 3.0: P(80) = 1.90 + 0.414938 sqrt(1.2 + 3.6) = 1.90 + 0.90908 = 2.809 < 3 -> not reached by the
  // horizon, although the line heads up towards the limit.
  const auto r = analyse_drift(worked(), upper(3.0));
  CHECK(r.status == DriftStatus::not_reached_within_horizon);
  CHECK_FALSE(r.reached);
  bool refused = false, said_why = false;
  for (const auto& s : r.explanation) {
    refused = refused || s.find("will not project a date beyond the horizon") != std::string::npos;
    said_why = said_why || s.find("no further than 2024-03-21") != std::string::npos;
  }
  CHECK(refused);
  CHECK(said_why);
}

TEST_CASE("a trend moving away from the only limit is not projected to reach it", "[stats][drift]") {
  DriftOptions o;
  o.tolerance.lower = -1.0;  // lower bound at d = 80: 1.90 - 0.909 = 0.99, far above -1
  const auto r = analyse_drift(worked(), o);
  CHECK(r.status == DriftStatus::not_reached_within_horizon);
  bool away = false;
  for (const auto& s : r.explanation) away = away || s.find("does not head towards a limit") != std::string::npos;
  CHECK(away);
}

TEST_CASE("a clear trend is significant", "[stats][drift]") {
  // y = 1.00, 1.10, 1.21, 1.30, 1.40 at d = 0..40 step 10: Sxy = 4.04 + 1.02 + 0.98 + 3.96 = 10.0, b1 = 0.01,
  // b0 = 1.202 - 0.2 = 1.002; residuals -0.002, -0.002, 0.008, -0.002, -0.002, SSE = 8e-5,
  // s = 0.0051640, se(b1) = 0.00016330, t = 61.2 > 12.92 (t table, p = 0.001, 3 dof) -> p < 0.001.
  const auto r = analyse_drift(plumb::test::weekly({1.00, 1.10, 1.21, 1.30, 1.40}, 0, "2024-01-01", 10));
  CHECK(r.status == DriftStatus::no_tolerance);
  CHECK_THAT(r.fit->coef[0], milligrams_near(1.002, ug(1e-9)));
  CHECK(r.slope_p_value < 0.001);
  CHECK(r.slope_significant);
}

TEST_CASE("too few results or no time span give a message, not a crash", "[stats][drift][errors]") {
  const auto two = analyse_drift(plumb::test::weekly({1.0, 1.1}), upper(2.0));
  CHECK(two.status == DriftStatus::not_enough_data);
  CHECK_FALSE(two.fit);
  CHECK_THAT(two.message, Catch::Contains("at least 3 results") && Catch::Contains("has 2"));
  const auto same_day = analyse_drift(plumb::test::weekly({1.0, 1.1, 1.2}, 0, "2024-05-06", 0), upper(2.0));
  CHECK(same_day.status == DriftStatus::not_enough_data);
  CHECK_THAT(same_day.message, Catch::Contains("dated 2024-05-06"));
  DriftOptions bad;
  bad.confidence = 1.5;
  CHECK_THROWS_WITH(analyse_drift(worked(), bad), Catch::Contains("confidence 1.5"));
  DriftOptions crossed;
  crossed.tolerance = {2.0, 1.0};
  CHECK_THROWS_AS(analyse_drift(worked(), crossed), plumb::InputError);
}

TEST_CASE("every drift sentence names its quantity, the fitted line's too", "[stats][drift]") {
  // Limit 1.85 mg: the line 1.02 + 0.011 d (worked example above) reaches it at d >= (1.85 - 1.02) / 0.011 = 75.45,
  // so on day 76 = 2024-03-17, inside the 80-day horizon.
  auto o = upper(1.85);
  o.quantity = "bias";
  const auto r = analyse_drift(worked(), o);
  REQUIRE(r.trend_reaches);
  CHECK(r.trend_reaches->date == parse_date("2024-03-17"));
  bool line_named = false, bound_named = false;
  for (const auto& s : r.explanation) {
    line_named = line_named || (s.find("The fitted line of bias itself reaches the upper limit") != std::string::npos &&
                                s.find("on 2024-03-17") != std::string::npos);
    bound_named = bound_named || s.find("prediction bound of the bias trend") != std::string::npos;
  }
  CHECK(line_named);
  CHECK(bound_named);
}
