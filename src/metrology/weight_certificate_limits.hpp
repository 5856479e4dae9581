#pragma once
// What OIML R 111-1:2004 asks of a reference weight's calibration certificate, given the weight's class:
// the correction (conventional mass minus nominal value) within the class MPE of Table 1, and the expanded
// uncertainty for k = 2 at most one third of that MPE (clause 5.2). A certificate outside either limit
// means the weight does not belong to the class it is registered in.
#include <optional>

#include "core/decimal.hpp"
#include "core/units.hpp"
#include "metrology/weight_classes.hpp"

namespace plumb::weights {

struct CertificateAgainstClass {
  std::optional<ExactMass> mpe;     ///< none: Table 1 gives no MPE for the class at this nominal value
  bool correction_within = false;   ///< |correction| <= MPE
  bool uncertainty_within = false;  ///< U for k = 2 <= MPE / 3
  [[nodiscard]] bool within() const { return mpe && correction_within && uncertainty_within; }
};

/// Judges a certificate exactly (no rounding): the uncertainty limit is tested as 6 U <= k MPE, which is
/// U * 2 / k <= MPE / 3 without a division, so a certificate's U given for another k is first brought to k = 2.
CertificateAgainstClass judge_certificate(WeightClass c, ExactMass nominal, ExactMass correction, ExactMass uncertainty,
                                          Decimal k);

/// U brought to k = 2 (U * 2 / k), for messages: rounded, never used for a verdict.
double uncertainty_for_k2_mg(ExactMass uncertainty, Decimal k);

}  // namespace plumb::weights
