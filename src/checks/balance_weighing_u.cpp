#include "checks/balance_weighing_u.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "core/errors.hpp"

namespace plumb::checks {

WeighingUncertainty weighing_uncertainty_at(const BalanceCalibrationUse& cal, Mass load) {
  if (cal.loads.empty())
    throw InputError(
        fmt::format("balance {}: its calibration run {} states no calibrated load.", cal.balance_id, cal.run_id));
  std::vector<CalibratedLoad> loads = cal.loads;
  for (const auto& l : loads)
    if (!(l.expanded.g() > 0.0) || !(l.k > 0.0) || !(l.load.g() > 0.0))
      throw InputError(
          fmt::format("balance {}: calibration run {} states a load {:.6g} g with U = {:.3g} g and "
                      "k = {}, which cannot give an uncertainty.",
                      cal.balance_id, cal.run_id, l.load.g(), l.expanded.g(), l.k));
  std::sort(loads.begin(), loads.end(), [](const auto& a, const auto& b) { return a.load < b.load; });
  const auto u_of = [](const CalibratedLoad& l) { return l.expanded / l.k; };
  const std::string run = fmt::format("calibration run {} of {}{}", cal.run_id, to_string(cal.performed_on),
                                      cal.certificate.empty() ? "" : " (certificate " + cal.certificate + ")");
  const auto at = [](const CalibratedLoad& l) {
    return fmt::format("U(E) = {:.3g} mg (k = {:.2f}) at {:.6g} g", l.expanded.mg(), l.k, l.load.g());
  };
  WeighingUncertainty w;
  if (!(loads.front().load < load)) {
    w.u = u_of(loads.front());
    w.basis = fmt::format(
        "balance {}, {}: {}, the smallest calibrated load, used at {:.6g} g; includes the rounding "
        "of d at zero and load (EURAMET cg-18)",
        cal.balance_id, run, at(loads.front()), load.g());
    return w;
  }
  if (loads.back().load < load) {
    w.u = u_of(loads.back()) * (load.g() / loads.back().load.g());
    w.basis = fmt::format(
        "balance {}, {}: {}, the largest calibrated load, scaled in proportion to {:.6g} g; "
        "includes the rounding of d at zero and load (EURAMET cg-18)",
        cal.balance_id, run, at(loads.back()), load.g());
    return w;
  }
  for (std::size_t i = 1; i < loads.size(); ++i) {
    if (loads[i].load < load) continue;
    const CalibratedLoad& a = loads[i - 1];
    const CalibratedLoad& b = loads[i];
    const double span = b.load.g() - a.load.g();
    const double f = span > 0.0 ? (load.g() - a.load.g()) / span : 1.0;
    w.u = u_of(a) + (u_of(b) - u_of(a)) * f;
    w.basis = fmt::format(
        "balance {}, {}: interpolated at {:.6g} g between {} and {}; includes the rounding of d "
        "at zero and load (EURAMET cg-18)",
        cal.balance_id, run, load.g(), at(a), at(b));
    return w;
  }
  w.u = u_of(loads.back());  // not reached: load is at most the largest
  return w;
}

}  // namespace plumb::checks
