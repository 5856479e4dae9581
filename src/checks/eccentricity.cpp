#include "checks/eccentricity.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cmath>
#include <set>

#include "core/errors.hpp"

namespace plumb::checks {

namespace {
std::string lower(std::string_view s) {
  std::string out;
  for (char ch : s) out.push_back(static_cast<char>(std::tolower(static_cast<unsigned char>(ch))));
  return out;
}
}  // namespace

Mass EccentricityResult::half_width_at(Mass load_at) const {
  return Mass::grams(max_abs_deviation.approx().g() / (2.0 * load.approx().g()) * load_at.g());
}

Mass EccentricityResult::uncertainty_at(Mass load_at) const {
  return half_width_at(load_at) / std::sqrt(3.0);
}

EccentricityResult evaluate_eccentricity(const EccentricityInput& in) {
  if (in.load.in_grams().units() <= 0)
    throw InputError(fmt::format("eccentricity load: {} is not positive.", in.load.to_string()));
  if (!in.centre)
    throw InputError("eccentricity centre: the run has no centre reading; the deviations are taken from it.");
  if (in.positions.size() < min_eccentricity_positions)
    throw InputError(fmt::format("eccentricity positions: {} off-centre position(s) given; at least {} are needed.",
                                 in.positions.size(), min_eccentricity_positions));
  std::set<std::string> seen;
  for (std::size_t i = 0; i < in.positions.size(); ++i) {
    const auto& p = in.positions[i];
    const std::string n = lower(p.name);
    if (n.empty())
      throw InputError(fmt::format("eccentricity position {}: the position has no name.", i + 1));
    if (n == "centre" || n == "center")
      throw InputError(fmt::format("eccentricity position {}: \"{}\" is the centre; give it as the centre reading.",
                                   i + 1, p.name));
    if (!seen.insert(n).second)
      throw InputError(fmt::format("eccentricity position {}: \"{}\" is named twice.", i + 1, p.name));
  }

  EccentricityResult r;
  r.load = in.load;
  r.centre = *in.centre;
  r.max_abs_deviation = ExactMass();
  for (const auto& p : in.positions) {
    const ExactMass dev = p.reading - r.centre;
    r.deviations.push_back({p.name, p.reading, dev});
    if (r.max_position.empty() || abs(dev) > r.max_abs_deviation) {
      r.max_abs_deviation = abs(dev);
      r.max_position = p.name;
    }
  }
  r.relative_max = r.max_abs_deviation.approx() / in.load.approx();
  return r;
}

}  // namespace plumb::checks
