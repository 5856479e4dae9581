// The error of indication and its uncertainty approximated over the calibrated range (EURAMET cg-18 v4.0, the
// approximations of chapter 7 / appendix C: E(R) as a straight line through zero or with offset, u^2(E(R)) =
// alpha^2 + beta^2 R^2). The section numbers and the exact weighting options of cg-18's appendix are recalled
// from memory; the least-squares sums below are worked by hand from the normal equations of an unweighted
// straight line (slope Sxy / Sxx, intercept ybar - slope xbar; through zero sum(xy) / sum(x^2)).
#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include "checks/range_approximation.hpp"
#include "core/errors.hpp"
#include "support/margin.hpp"

using plumb::test::grams_near;
using plumb::test::mg;
using plumb::test::ug;
namespace ck = plumb::checks;

TEST_CASE("range approximation recovers a straight line through zero and alpha, beta, by hand",
          "[unit][uncertainty][range]") {
  // Invented loads 50 to 250 g with E = 2e-6 R exactly and u(E) = sqrt((0.1 mg)^2 + (1e-6 R)^2), k = 2 except
  // 2.05 at 150 g: the fits must give a1 = 2e-6, alpha = 0.1 mg, beta = 1e-6, no envelope raise, k = 2.05.
  std::vector<ck::ApproximationPoint> p;
  for (double r : {50.0, 100.0, 150.0, 200.0, 250.0})
    p.push_back({r, 2e-6 * r, std::sqrt(1e-8 + 1e-12 * r * r), r == 150.0 ? 2.05 : 2.0});
  const auto a = ck::approximate_over_range(p, plumb::stats::Model::through_origin);
  CHECK(a.error_fit.coef.at(0) == Approx(2e-6).margin(1e-12).epsilon(0));
  CHECK_THAT(a.alpha_g, grams_near(1e-4, ug(0.001)));
  CHECK(a.beta == Approx(1e-6).margin(1e-10).epsilon(0));
  CHECK(a.envelope_raise_g2 == Approx(0).margin(1e-15).epsilon(0));
  CHECK(a.k == Approx(2.05).margin(1e-12).epsilon(0));
  // At R = 120 g: E = 2e-6 x 120 = 0.24 mg; u = sqrt(1e-8 + 1e-12 x 14400) g = sqrt(2.44e-8) g = 0.156205 mg;
  // U = 2.05 x 0.156205 = 0.320220 mg.
  CHECK_THAT(a.error_at(120), grams_near(2.4e-4, ug(0.001)));
  CHECK_THAT(a.u_at(120), grams_near(1.56205e-4, ug(0.001)));
  CHECK_THAT(a.expanded_at(120), grams_near(3.20220e-4, ug(0.002)));
  CHECK(a.form() == "straight line through zero");
}

TEST_CASE("range approximation raises alpha to cover every calibrated load, by hand", "[unit][uncertainty][range]") {
  // E = 0 everywhere (no residuals); u^2(E) = 2, 2, 2, 2, 7 mg^2 at R = 1..5 g, so x = R^2 = 1, 4, 9, 16, 25 g^2.
  // xbar = 11, ybar = 3, Sxx = 100 + 49 + 4 + 25 + 196 = 374, Sxy = 10 + 7 + 2 - 5 + 56 = 70:
  // beta^2 = 70 / 374 = 0.18716578 mg^2/g^2, alpha^2 = 3 - 11 x 70 / 374 = 0.94117647 mg^2.
  // The line gives 5.62032086 mg^2 at x = 25, short of 7 by 1.37967914 mg^2 (the largest shortfall), so
  // alpha^2 = 0.94117647 + 1.37967914 = 2.32085561 mg^2 (alpha = 1.52343546 mg), beta = sqrt(0.18716578e-6)
  // = 4.3262661e-4.
  std::vector<ck::ApproximationPoint> p;
  for (int r = 1; r <= 5; ++r) p.push_back({double(r), 0.0, std::sqrt((r == 5 ? 7.0 : 2.0) * 1e-6), 2.0});
  const auto a = ck::approximate_over_range(p, plumb::stats::Model::through_origin);
  CHECK(a.envelope_raise_g2 == Approx(1.37967914e-6).margin(1e-14).epsilon(0));
  CHECK_THAT(a.alpha_g, grams_near(1.52343546e-3, ug(0.001)));
  CHECK(a.beta == Approx(4.3262661e-4).margin(1e-11).epsilon(0));
  // The approximation reaches the outlying load exactly: u(5 g) = sqrt(7) mg = 2.6457513 mg.
  CHECK_THAT(a.u_at(5), grams_near(2.6457513e-3, ug(0.001)));
  for (const auto& q : p) CHECK(a.u_at(q.reading_g) >= q.u_g - 1e-15);
}

TEST_CASE("range approximation with offset adds the model's miss, a falling slope gives a constant u",
          "[unit][uncertainty][range]") {
  // E = 0.1, 0.2, 0.4, 0.4, 0.5 mg at R = 1..5 g. Straight line: xbar = 3, ybar = 0.32 mg, Sxx = 10,
  // Sxy = 0.44 + 0.12 + 0 + 0.08 + 0.36 = 1.0 mg g, a1 = 0.1 mg/g = 1e-4, a0 = 0.32 - 0.3 = 0.02 mg; residuals
  // -0.02, -0.02, +0.08, -0.02, -0.02 mg. With u(E) = 0.1 mg at each load, v = 0.01 + r^2 = 0.0104, 0.0104,
  // 0.0164, 0.0104, 0.0104 mg^2; against x = R^2: deviations from ybar = 0.0116 are -0.0012 x 4 and +0.0048 at
  // x = 9, Sxy = 0.012 + 0.0084 - 0.0096 - 0.006 - 0.0168 = -0.012 < 0: beta = 0 and alpha^2 = max v =
  // 0.0164 mg^2, alpha = 0.12806248 mg.
  std::vector<ck::ApproximationPoint> p;
  const double e_mg[] = {0.1, 0.2, 0.4, 0.4, 0.5};
  for (int r = 1; r <= 5; ++r) p.push_back({double(r), e_mg[r - 1] * 1e-3, 1e-4, 2.0});
  const auto a = ck::approximate_over_range(p, plumb::stats::Model::line);
  CHECK_THAT(a.error_fit.coef.at(0), grams_near(2e-5, ug(0.0001)));
  CHECK(a.error_fit.coef.at(1) == Approx(1e-4).margin(1e-12).epsilon(0));
  CHECK(a.beta == Approx(0).margin(1e-15).epsilon(0));
  CHECK_THAT(a.alpha_g, grams_near(1.2806248e-4, ug(0.0001)));
  CHECK(a.form() == "straight line with offset");
  // Through zero on the same errors: a1 = sum(R E) / sum(R^2) = (0.1 + 0.4 + 1.2 + 1.6 + 2.5) / 55 = 5.8 / 55
  // = 0.10545455 mg/g.
  const auto z = ck::approximate_over_range(p, plumb::stats::Model::through_origin);
  CHECK(z.error_fit.coef.at(0) == Approx(1.0545455e-4).margin(1e-11).epsilon(0));
}

TEST_CASE("range approximation refuses a load without a positive uncertainty", "[unit][uncertainty][range]") {
  std::vector<ck::ApproximationPoint> p{{1, 0, 1e-4, 2}, {2, 0, 0, 2}, {3, 0, 1e-4, 2}};
  CHECK_THROWS_AS(ck::approximate_over_range(p, plumb::stats::Model::line), plumb::InputError);
}
