#include "stats/coverage.hpp"

#include <boost/math/distributions/normal.hpp>
#include <boost/math/distributions/students_t.hpp>
#include <fmt/format.h>

#include <cmath>

#include "core/errors.hpp"

namespace plumb::stats {

double p_95_45() {
  static const double p = std::erf(std::sqrt(2.0));
  return p;
}

double coverage_factor(double dof, double p) {
  if (!(p > 0.0 && p < 1.0))
    throw InputError(fmt::format("coverage probability: {} is not between 0 and 1.", p));
  if (!(dof > 0.0))
    throw InputError(fmt::format("degrees of freedom: {} is not positive.", dof));
  const double upper_tail = (1.0 - p) / 2.0;
  if (std::isinf(dof)) {
    const boost::math::normal_distribution<double> z;
    return boost::math::quantile(boost::math::complement(z, upper_tail));
  }
  const boost::math::students_t_distribution<double> t(dof);
  return boost::math::quantile(boost::math::complement(t, upper_tail));
}

}  // namespace plumb::stats
