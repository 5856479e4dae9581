#pragma once
// A reference weight's density (with its standard uncertainty) or density class, and its drift allowance D:
// what a EURAMET cg-18 budget needs for the air buoyancy and drift of the weights beyond the certificate. Stated
// with `weight add` or later with `weight set-properties`; each statement is a new row (store/weight_properties),
// and what a calibration uses is resolved here with the source of each value.
#include <optional>
#include <string>

#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"
#include "store/weight_properties.hpp"

namespace plumb::app {

/// As typed: --density 7950kg/m3 with --density-u 5kg/m3, or --density-class E2; --drift 0.02mg.
struct WeightPropertiesInput {
  std::optional<std::string> density, density_u, density_class, drift;
  [[nodiscard]] bool empty() const { return !density && !density_u && !density_class && !drift; }
};

/// Validates `in` for weight `w`, naming the option in any InputError; what `in` leaves out is carried over from
/// `previous` (the statement in force), and a density never stated is the weight's own class.
store::WeightProperties parse_weight_properties(const WeightPropertiesInput& in, const store::WeightRecord& w,
                                                const std::optional<store::WeightProperties>& previous);

/// Appends a statement for a registered weight (one transaction, through the Recorder).
store::WeightProperties set_weight_properties(store::Database& db, const store::Actor& actor, const std::string& id,
                                              const WeightPropertiesInput& in);

/// The density a calibration budget uses for the weight, with where it came from.
struct WeightDensity {
  double rho_kg_m3 = 8000.0;
  double u_kg_m3 = 0.0;  ///< standard uncertainty
  std::string source;    ///< e.g. "entered 2026-11-02 by Q. Manager" or the OIML R 111-1:2004 Table 5 basis
};
/// Throws InputError when nothing was entered and OIML R 111-1:2004 Table 5 sets no limit for the weight's class
/// at its nominal value (the message says how to enter the density).
WeightDensity density_for_budget(const store::WeightRecord& w, const std::optional<store::WeightProperties>& p);

}  // namespace plumb::app
