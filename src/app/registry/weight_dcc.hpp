#pragma once
// A reference weight's new calibration certificate read from the DCC (DCC 3.1.2 XML) its calibration
// provider sent, instead of typed: the file must validate against the DCC schema, name this weight among the
// item's identifications, and give the conventional mass or its correction with U and k; the certificate
// number and calibration date come from its core data. The weight's OIML R 111 class check then applies as
// for a typed certificate. What plumb reads from which element is listed in doc/dcc.md.
#include <optional>
#include <string>

#include "app/registry/weight_certificate.hpp"
#include "app/registry/weights.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::app {

struct WeightDccInput {
  std::string file;                ///< the provider's DCC
  std::string schema;              ///< dcc-3.1.2 XSD whose D-SI import is a local file
  std::optional<std::string> due;  ///< required when the DCC states no due date; wins over it otherwise
  std::optional<std::string> override_reason;
};

/// The certificate of `weight` that the DCC gives, as the texts `weight recalibrate` would have been typed
/// with. InputError naming the file (and the element or value at fault) when the file is not well-formed,
/// does not validate, names another weight, or lacks a value plumb needs.
WeightCertificateInput weight_certificate_from_dcc(const store::WeightRecord& weight, const WeightDccInput& in);

/// recalibrate_weight with the certificate read from the DCC.
RecalibrationOutcome recalibrate_weight_from_dcc(store::Database& db, const store::Actor& actor, const std::string& id,
                                                 const WeightDccInput& in);

}  // namespace plumb::app
