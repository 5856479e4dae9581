#pragma once
// The registry entries most tests start from, invented: a class E2 reference weight and a 220 g / 0.1 mg
// balance judged by USP <41>. Tests change the fields they care about. Header-only so it needs no build change.
#include <string>

#include "app/registry/weights.hpp"
#include "app/registry/balances.hpp"

namespace plumb::test {

/// A class E2 weight with U = 0.05 mg and one certificate valid from `calibrated` to `due`.
inline app::WeightInput e2_weight(const std::string& id, const std::string& nominal, const std::string& certificate,
                                  const std::string& calibrated, const std::string& due) {
  app::WeightInput w;
  w.id = id;
  w.nominal = nominal;
  w.weight_class = "E2";
  w.uncertainty = "0.05mg";
  w.certificate = certificate;
  w.calibrated = calibrated;
  w.due = due;
  return w;
}

/// A 220 g balance with d = 0.1 mg and a smallest net weight of 200 mg (USP <41>), checked every `every`.
inline app::BalanceInput usp41_balance(const std::string& id, const std::string& every, const std::string& since) {
  app::BalanceInput b;
  b.id = id;
  b.capacity = "220g";
  b.readability = "0.1mg";
  b.every = every;
  b.smallest_net = "200mg";
  b.since = since;
  return b;
}

}  // namespace plumb::test
