#include "app/registry/weight_in_force.hpp"

namespace plumb::app {

const store::WeightCalibration* certificate_in_force(const std::vector<store::WeightCalibration>& history, Date on) {
  const store::WeightCalibration* in_force = nullptr;
  for (const auto& c : history)
    if (c.calibrated_on <= on) in_force = &c;  // oldest first: the last one reached is the latest
  return in_force;
}

bool overdue_on(const store::WeightCalibration& certificate, Date on) {
  return days_between(certificate.due_on, on) > 0;
}

}  // namespace plumb::app
