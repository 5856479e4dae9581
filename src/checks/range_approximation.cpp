#include "checks/range_approximation.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "core/errors.hpp"

namespace plumb::checks {

double RangeApproximation::u_at(double reading_g) const {
  return std::sqrt(alpha_g * alpha_g + beta * beta * reading_g * reading_g);
}

std::string RangeApproximation::error_formula() const {
  const auto& c = error_fit.coef;
  switch (error_fit.model) {
    case stats::Model::through_origin:
      return fmt::format("E(R) = {:+.4e} R", c.at(0));
    case stats::Model::line:
      return fmt::format("E(R) = {:+.4e} g {:+.4e} R", c.at(0), c.at(1));
    case stats::Model::quadratic:
      return fmt::format("E(R) = {:+.4e} g {:+.4e} R {:+.4e} R^2 / g", c.at(0), c.at(1), c.at(2));
  }
  return "";
}

std::string RangeApproximation::uncertainty_formula() const {
  return fmt::format("u(E(R)) = sqrt(({:.4g} mg)^2 + ({:.4e} R)^2)", alpha_g * 1e3, beta);
}

std::string RangeApproximation::form() const {
  switch (error_fit.model) {
    case stats::Model::through_origin:
      return "straight line through zero";
    case stats::Model::line:
      return "straight line with offset";
    case stats::Model::quadratic:
      return "quadratic";
  }
  return "";
}

RangeApproximation approximate_over_range(std::span<const ApproximationPoint> points, stats::Model model) {
  std::vector<double> r, e, r2, v;
  RangeApproximation a;
  a.k = 0;
  r.reserve(points.size());
  e.reserve(points.size());
  r2.reserve(points.size());
  v.reserve(points.size());
  for (std::size_t j = 0; j < points.size(); ++j) {
    const auto& p = points[j];
    if (!(p.u_g > 0) || !(p.k > 0))
      throw InputError(fmt::format("load {}: u(E) {} g or k {} is not positive; no approximation over the range.",
                                   j + 1, p.u_g, p.k));
    r.push_back(p.reading_g);
    e.push_back(p.error_g);
    a.k = std::max(a.k, p.k);
  }
  a.error_fit = stats::fit(model, r, e);
  a.reading_min_g = a.error_fit.x_min;
  a.reading_max_g = a.error_fit.x_max;
  for (std::size_t j = 0; j < points.size(); ++j) {
    const double miss = a.error_fit.residuals.at(j);
    r2.push_back(r[j] * r[j]);
    v.push_back(points[j].u_g * points[j].u_g + miss * miss);
  }
  double alpha2 = 0, beta2 = 0;
  const auto line = stats::fit(stats::Model::line, r2, v);
  alpha2 = line.coef[0];
  beta2 = line.coef[1];
  if (beta2 < 0) {
    // u(E) that falls with the load is no model of a balance: take it as constant.
    beta2 = 0;
    alpha2 = *std::max_element(v.begin(), v.end());
  } else if (alpha2 < 0) {
    alpha2 = 0;
    beta2 = stats::fit(stats::Model::through_origin, r2, v).coef[0];
  }
  double shortfall = 0;
  for (std::size_t j = 0; j < v.size(); ++j) shortfall = std::max(shortfall, v[j] - (alpha2 + beta2 * r2[j]));
  a.envelope_raise_g2 = shortfall;
  alpha2 += shortfall;
  a.alpha_g = std::sqrt(alpha2);
  a.beta = std::sqrt(beta2);
  return a;
}

}  // namespace plumb::checks
