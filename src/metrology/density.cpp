#include "metrology/density.hpp"

#include <cmath>

namespace plumb::density {

double water_tanaka(double t_c) {
  constexpr double a1 = -3.983035, a2 = 301.797, a3 = 522528.9, a4 = 69.34881, a5 = 999.974950;
  return a5 * (1.0 - (t_c + a1) * (t_c + a1) * (t_c + a2) / (a3 * (t_c + a4)));
}

double air_oiml_r111(double t_c, double pressure_hpa, double rh_pct) {
  return (0.34848 * pressure_hpa - 0.009 * rh_pct * std::exp(0.061 * t_c)) / (273.15 + t_c);
}

}  // namespace plumb::density
