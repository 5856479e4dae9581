#include "stats/regression.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <set>

#include "core/errors.hpp"

namespace plumb::stats {
namespace {

using Real = long double;

std::size_t parameters(Model m) {
  switch (m) {
    case Model::line: return 2;
    case Model::through_origin: return 1;
    case Model::quadratic: return 3;
  }
  return 2;
}

std::vector<Real> design_row(Model m, Real x) {
  switch (m) {
    case Model::line: return {1.0L, x};
    case Model::through_origin: return {x};
    case Model::quadratic: return {1.0L, x, x * x};
  }
  return {};
}

// Householder QR of the n x p design matrix A (column-major), applied to y as well.
// Solving R b = Q^T y avoids squaring the condition number as the normal equations would.
struct Qr {
  std::vector<std::vector<Real>> r;  // p x p upper triangle
  std::vector<Real> qty;             // first p entries of Q^T y
};

Qr householder(std::vector<std::vector<Real>> cols, std::vector<Real> y) {
  const std::size_t n = y.size(), p = cols.size();
  for (std::size_t k = 0; k < p; ++k) {
    Real norm = 0;
    for (std::size_t i = k; i < n; ++i) norm += cols[k][i] * cols[k][i];
    norm = std::sqrt(norm);
    if (norm == 0) continue;
    const Real alpha = cols[k][k] > 0 ? -norm : norm;
    std::vector<Real> v(n, 0.0L);
    for (std::size_t i = k; i < n; ++i) v[i] = cols[k][i];
    v[k] -= alpha;
    Real vnorm2 = 0;
    for (std::size_t i = k; i < n; ++i) vnorm2 += v[i] * v[i];
    if (vnorm2 == 0) continue;
    const auto reflect = [&](std::vector<Real>& c) {
      Real dot = 0;
      for (std::size_t i = k; i < n; ++i) dot += v[i] * c[i];
      const Real f = 2 * dot / vnorm2;
      for (std::size_t i = k; i < n; ++i) c[i] -= f * v[i];
    };
    for (std::size_t j = k; j < p; ++j) reflect(cols[j]);
    reflect(y);
  }
  Qr qr;
  qr.r.assign(p, std::vector<Real>(p, 0.0L));
  for (std::size_t i = 0; i < p; ++i)
    for (std::size_t j = i; j < p; ++j) qr.r[i][j] = cols[j][i];
  qr.qty.assign(y.begin(), y.begin() + static_cast<std::ptrdiff_t>(p));
  return qr;
}

}  // namespace

std::string_view to_string(Model m) {
  switch (m) {
    case Model::line: return "line";
    case Model::through_origin: return "through_origin";
    case Model::quadratic: return "quadratic";
  }
  return "line";
}

Fit fit(Model model, std::span<const double> x, std::span<const double> y) {
  if (x.size() != y.size()) throw InputError("fit: x and y have different lengths.");
  const std::size_t p = parameters(model), n = x.size();
  const std::set<double> distinct(x.begin(), x.end());
  const std::size_t need_distinct = model == Model::through_origin ? 1 : p;
  if (distinct.size() < need_distinct || (model == Model::through_origin && distinct == std::set<double>{0.0}))
    throw InputError(fmt::format("a {} fit needs at least {} distinct x value(s); {} given.", to_string(model),
                                 need_distinct, distinct.size()));
  if (n <= p)
    throw InputError(fmt::format("a {} fit needs at least {} points to estimate its scatter; {} given.",
                                 to_string(model), p + 1, n));

  std::vector<std::vector<Real>> cols(p, std::vector<Real>(n));
  std::vector<Real> yy(n);
  for (std::size_t i = 0; i < n; ++i) {
    const auto row = design_row(model, x[i]);
    for (std::size_t j = 0; j < p; ++j) cols[j][i] = row[j];
    yy[i] = y[i];
  }
  const Qr qr = householder(cols, yy);

  // Back substitution for b, and R^-1 for the covariance (X^T X)^-1 = R^-1 R^-T.
  std::vector<Real> b(p);
  for (std::size_t i = p; i-- > 0;) {
    Real s = qr.qty[i];
    for (std::size_t j = i + 1; j < p; ++j) s -= qr.r[i][j] * b[j];
    b[i] = s / qr.r[i][i];
  }
  std::vector<std::vector<Real>> rinv(p, std::vector<Real>(p, 0.0L));
  for (std::size_t c = 0; c < p; ++c) {
    for (std::size_t i = p; i-- > 0;) {
      Real s = i == c ? 1.0L : 0.0L;
      for (std::size_t j = i + 1; j < p; ++j) s -= qr.r[i][j] * rinv[j][c];
      rinv[i][c] = s / qr.r[i][i];
    }
  }

  Fit f;
  f.model = model;
  f.n = n;
  f.dof = static_cast<int>(n - p);
  Real sse = 0, sum_y = 0, sum_y2 = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const auto row = design_row(model, x[i]);
    Real pred = 0;
    for (std::size_t j = 0; j < p; ++j) pred += row[j] * b[j];
    const Real e = yy[i] - pred;
    f.residuals.push_back(static_cast<double>(e));
    sse += e * e;
    sum_y += yy[i];
    sum_y2 += yy[i] * yy[i];
  }
  Real sst = 0;
  const Real mean_y = sum_y / static_cast<Real>(n);
  for (std::size_t i = 0; i < n; ++i) sst += (yy[i] - mean_y) * (yy[i] - mean_y);
  const Real s2 = sse / static_cast<Real>(f.dof);
  f.sse = static_cast<double>(sse);
  f.residual_sd = static_cast<double>(std::sqrt(s2));
  f.rmse = static_cast<double>(std::sqrt(sse / static_cast<Real>(n)));
  f.r_squared = static_cast<double>(model == Model::through_origin ? 1 - sse / sum_y2 : 1 - sse / sst);
  f.xtx_inverse.assign(p * p, 0.0);
  for (std::size_t i = 0; i < p; ++i) {
    for (std::size_t j = 0; j < p; ++j) {
      Real s = 0;
      for (std::size_t k = 0; k < p; ++k) s += rinv[i][k] * rinv[j][k];
      f.xtx_inverse[i * p + j] = static_cast<double>(s);
    }
  }
  for (std::size_t j = 0; j < p; ++j) {
    f.coef.push_back(static_cast<double>(b[j]));
    f.coef_se.push_back(static_cast<double>(std::sqrt(s2 * static_cast<Real>(f.xtx_inverse[j * p + j]))));
  }
  const auto [lo, hi] = std::minmax_element(x.begin(), x.end());
  f.x_min = *lo;
  f.x_max = *hi;
  return f;
}

double Fit::predict(double x) const {
  const auto row = design_row(model, x);
  Real s = 0;
  for (std::size_t j = 0; j < coef.size(); ++j) s += row[j] * coef[j];
  return static_cast<double>(s);
}

double Fit::se_mean(double x) const {
  const auto row = design_row(model, x);
  const std::size_t p = coef.size();
  Real q = 0;
  for (std::size_t i = 0; i < p; ++i)
    for (std::size_t j = 0; j < p; ++j) q += row[i] * xtx_inverse[i * p + j] * row[j];
  return residual_sd * static_cast<double>(std::sqrt(q));
}

double Fit::se_prediction(double x) const {
  const double m = se_mean(x);
  return std::sqrt(residual_sd * residual_sd + m * m);
}

std::string Fit::equation(int digits, std::string_view xn, std::string_view yn) const {
  const auto term = [&](double c, std::string_view suffix, bool first) {
    if (first) return fmt::format("{:.{}g}{}", c, digits, suffix);
    return fmt::format(" {} {:.{}g}{}", c < 0 ? '-' : '+', std::abs(c), digits, suffix);
  };
  const std::string x1 = fmt::format(" {}", xn), x2 = fmt::format(" {}^2", xn);
  switch (model) {
    case Model::through_origin: return fmt::format("{} = {}", yn, term(coef[0], x1, true));
    case Model::line: return fmt::format("{} = {}{}", yn, term(coef[1], x1, true), term(coef[0], "", false));
    case Model::quadratic:
      return fmt::format("{} = {}{}{}", yn, term(coef[2], x2, true), term(coef[1], x1, false), term(coef[0], "", false));
  }
  return {};
}

double log_relative_error(double computed, double certified) {
  if (computed == certified) return 15.0;
  if (certified == 0) return -std::log10(std::abs(computed));
  return std::min(15.0, -std::log10(std::abs(computed - certified) / std::abs(certified)));
}

}  // namespace plumb::stats
