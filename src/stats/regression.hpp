#pragma once
// Least-squares fits of y against x: a straight line, a line through the origin, and a quadratic.
// Used for the error of indication of a balance (reading against reference mass) and for drift of a
// result against time. Computed with orthogonal decomposition (not the normal equations) so that the
// NIST StRD certified values are reproduced to 11 or more significant digits.
#include <span>
#include <string>
#include <vector>

namespace plumb::stats {

enum class Model { line, through_origin, quadratic };
std::string_view to_string(Model m);

struct Fit {
  Model model = Model::line;
  std::vector<double> coef;     ///< b0, b1 (line); b1 (through origin); b0, b1, b2 (quadratic)
  std::vector<double> coef_se;  ///< standard errors of coef
  std::size_t n = 0;
  int dof = 0;                  ///< n - number of coefficients
  double residual_sd = 0.0;     ///< sqrt(SSE / dof)
  double r_squared = 0.0;       ///< centred; uncentred 1 - SSE / sum(y^2) for through_origin
  double rmse = 0.0;            ///< sqrt(SSE / n)
  double sse = 0.0;
  double x_min = 0.0, x_max = 0.0;
  std::vector<double> residuals;
  /// (X^T X)^-1, row-major p x p, for prediction intervals.
  std::vector<double> xtx_inverse;

  [[nodiscard]] double predict(double x) const;
  /// Standard error of the fitted mean at x, and of a new observation at x.
  [[nodiscard]] double se_mean(double x) const;
  [[nodiscard]] double se_prediction(double x) const;
  /// True when x lies inside the range of the fitted data (interpolation).
  [[nodiscard]] bool interpolates(double x) const { return x >= x_min && x <= x_max; }
  /// "y = 1.0002 x - 0.00012" style equation with `digits` significant digits.
  [[nodiscard]] std::string equation(int digits = 6, std::string_view x = "x", std::string_view y = "y") const;
};

/// Fits `model`. Throws InputError when there are too few points (or distinct x) for the model.
Fit fit(Model model, std::span<const double> x, std::span<const double> y);

/// Log relative error, -log10(|computed - certified| / |certified|), capped at 15 (NIST StRD practice).
double log_relative_error(double computed, double certified);

}  // namespace plumb::stats
