#include <catch2/catch.hpp>

#include "core/errors.hpp"
#include "stats/regression.hpp"

using plumb::stats::Model;

TEST_CASE("quadratic fit recovers an exact parabola", "[regression]") {
  // Worked by hand: y = 2 + 0.5 x - 0.25 x^2 at x = 0..4 gives 2, 2.25, 2, 1.25, 0 (no noise, SSE = 0).
  const std::vector<double> x{0, 1, 2, 3, 4}, y{2, 2.25, 2, 1.25, 0};
  const auto f = plumb::stats::fit(Model::quadratic, x, y);
  CHECK(f.coef[0] == Approx(2.0).margin(1e-12).epsilon(0));
  CHECK(f.coef[1] == Approx(0.5).margin(1e-12).epsilon(0));
  CHECK(f.coef[2] == Approx(-0.25).margin(1e-12).epsilon(0));
  CHECK(f.r_squared == Approx(1.0).margin(1e-12).epsilon(0));
  CHECK(f.predict(2.5) == Approx(2 + 1.25 - 1.5625).margin(1e-12).epsilon(0));
}

TEST_CASE("line fit statistics worked by hand", "[regression]") {
  // x = 1,2,3,4; y = 1,3,2,4. By hand: xbar = 2.5, ybar = 2.5, Sxx = 5, Sxy = 4 -> b1 = 0.8, b0 = 0.5.
  // Residuals: 1-1.3=-0.3, 3-2.1=0.9, 2-2.9=-0.9, 4-3.7=0.3 -> SSE = 1.8; SST = 5 -> R^2 = 0.64;
  // s = sqrt(1.8/2) = 0.948683; se(b1) = s/sqrt(5) = 0.424264; RMSE = sqrt(1.8/4) = 0.670820.
  const std::vector<double> x{1, 2, 3, 4}, y{1, 3, 2, 4};
  const auto f = plumb::stats::fit(Model::line, x, y);
  CHECK(f.coef[1] == Approx(0.8).epsilon(1e-12));
  CHECK(f.coef[0] == Approx(0.5).epsilon(1e-12));
  CHECK(f.sse == Approx(1.8).epsilon(1e-12));
  CHECK(f.r_squared == Approx(0.64).epsilon(1e-12));
  CHECK(f.residual_sd == Approx(0.948683).epsilon(1e-6));
  CHECK(f.coef_se[1] == Approx(0.424264).epsilon(1e-6));
  CHECK(f.rmse == Approx(0.670820).epsilon(1e-6));
  CHECK(f.interpolates(2.5));
  CHECK_FALSE(f.interpolates(5.0));
  CHECK(f.equation(3) == "y = 0.8 x + 0.5");
}

TEST_CASE("fits refuse too few points or distinct x", "[regression]") {
  const std::vector<double> x{1, 1, 2, 2}, y{1, 2, 3, 4};
  CHECK_THROWS_AS(plumb::stats::fit(Model::quadratic, x, y), plumb::InputError);
  const std::vector<double> x2{1, 2}, y2{1, 2};
  CHECK_THROWS_AS(plumb::stats::fit(Model::line, x2, y2), plumb::InputError);
}
