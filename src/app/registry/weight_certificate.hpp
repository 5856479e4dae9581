#pragma once
// A reference weight's calibration certificate as typed (on `weight add` and `weight recalibrate`): each field
// validated and named when wrong, and the certificate judged against the weight's OIML R 111 class.
#include <optional>
#include <string>

#include "store/records.hpp"
#include "store/weight_certificates.hpp"

namespace plumb::app {

struct WeightCertificateInput {
  std::string certificate, correction = "0g", uncertainty, k = "2", calibrated, due;
  /// Accepts a certificate outside the weight's class; the reason is recorded (schema/007_weight_overrides.sql).
  std::optional<std::string> override_reason;
};

/// The certificate's fields parsed and checked for plausibility (dates in order, k from 1 to 10, the
/// correction at most 1 % of `nominal` so that a wrong unit shows). InputError naming the option.
store::WeightCalibration parse_weight_certificate(const WeightCertificateInput& in, ExactMass nominal);

/// Judges the certificate against the weight's class (OIML R 111-1:2004: |correction| <= MPE of Table 1,
/// U for k = 2 <= MPE / 3). Within the class and no --override-reason: nothing to record. Outside it: an
/// InputError naming the field, its value, the class and the MPE, unless an override reason is given, when
/// the override to record is returned (its weight_calibration_id still to be set). An override reason for a
/// certificate within its class is refused too: there would be nothing it overrides.
std::optional<store::WeightClassOverride> judge_against_class(const store::WeightRecord& weight,
                                                              const store::WeightCalibration& certificate,
                                                              const WeightCertificateInput& typed);

}  // namespace plumb::app
