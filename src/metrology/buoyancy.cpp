#include "metrology/buoyancy.hpp"

#include <fmt/format.h>

#include <cmath>

#include "core/errors.hpp"

namespace plumb::buoyancy {

namespace {
void check_density(double rho, const char* field) {
  // A body no denser than air cannot be weighed as a weight; 100 kg/m3 is far below any weight material.
  if (!std::isfinite(rho) || rho < 100.0 || rho > 25000.0)
    throw InputError(fmt::format("{}: {} kg/m3 is not a plausible density of a weight (100 to 25000 kg/m3).", field,
                                 rho));
}
void check_air(double rho_a) {
  if (!std::isfinite(rho_a) || rho_a < 0.5 || rho_a > 1.5)
    throw InputError(fmt::format("air density: {} kg/m3 is outside the plausible range 0.5 to 1.5 kg/m3.", rho_a));
}
void check_u(double u, const char* field) {
  if (!std::isfinite(u) || u < 0.0)
    throw InputError(fmt::format("{}: {} is not a non-negative number.", field, u));
}
}  // namespace

double conventional_from_true(double true_mass, double rho) {
  check_density(rho, "weight density");
  return true_mass * (1.0 - rho_0 / rho) / (1.0 - rho_0 / rho_c);
}

double true_from_conventional(double conventional_mass, double rho) {
  check_density(rho, "weight density");
  return conventional_mass * (1.0 - rho_0 / rho_c) / (1.0 - rho_0 / rho);
}

double indication_for(double conventional_mass, double rho, double rho_a) {
  check_density(rho, "weight density");
  check_air(rho_a);
  return true_from_conventional(conventional_mass, rho) * (1.0 - rho_a / rho) / (1.0 - rho_a / rho_c);
}

BuoyancyCorrection correction(const BuoyancyInput& in) {
  if (!std::isfinite(in.conventional_mass) || in.conventional_mass < 0.0)
    throw InputError(fmt::format("conventional mass: {} is not a non-negative number.", in.conventional_mass));
  check_density(in.rho, "weight density");
  check_air(in.rho_a);
  check_u(in.u_rho, "weight density uncertainty");
  check_u(in.u_rho_a, "air density uncertainty");
  const double m = in.conventional_mass;
  const double inv = 1.0 / in.rho - 1.0 / rho_c;
  BuoyancyCorrection r;
  r.correction = -m * (in.rho_a - rho_0) * inv;
  r.exact_correction = indication_for(m, in.rho, in.rho_a) - m;
  r.u_from_air = m * std::abs(inv) * in.u_rho_a;
  r.u_from_weight = m * std::abs(in.rho_a - rho_0) * in.u_rho / (in.rho * in.rho);
  r.u_second_order = m * in.u_rho_a * in.u_rho / (in.rho * in.rho);
  r.u =
      std::sqrt(r.u_from_air * r.u_from_air + r.u_from_weight * r.u_from_weight + r.u_second_order * r.u_second_order);
  return r;
}

}  // namespace plumb::buoyancy
