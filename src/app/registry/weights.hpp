#pragma once
// Registering a reference weight with its first calibration certificate, and appending the certificates of
// its later calibrations. Inputs arrive as the user typed them; every field is validated here and named in
// the error when wrong, and every certificate is judged against the weight's OIML R 111 class.
#include <optional>
#include <string>

#include "app/registry/weight_certificate.hpp"
#include "app/registry/weight_properties.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::app {

struct WeightInput {
  std::string id, nominal, weight_class, correction = "0g", uncertainty, k = "2", certificate, calibrated, due;
  std::optional<std::string> density;  ///< kg/m3, with density_u; else the class's OIML R 111 Table 5 limits
  std::optional<std::string> density_u, density_class, drift;  ///< see WeightPropertiesInput
  std::optional<std::string> override_reason;  ///< see WeightCertificateInput
};
store::WeightRecord add_weight(store::Database& db, const store::Actor& actor, const WeightInput& in);

/// A new certificate for a registered weight (its recalibration), appended beside the earlier ones: each
/// keeps its own number, dates, correction, U and k, and the one in force on a date is the one
/// certificate_in_force picks (weight_in_force.hpp). Refused: an unknown weight, a certificate number the
/// weight already has, a certificate outside the weight's class without an override reason.
struct RecalibrationOutcome {
  store::WeightRecord weight;            ///< with the new certificate as `current`
  bool in_force_today = false;           ///< false when a later certificate is already recorded
  std::optional<std::string> overridden;  ///< what the recorded override accepted ("correction", ...)
};
RecalibrationOutcome recalibrate_weight(store::Database& db, const store::Actor& actor, const std::string& id,
                                        const WeightCertificateInput& in);

}  // namespace plumb::app
