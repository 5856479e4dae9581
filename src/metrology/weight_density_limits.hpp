#pragma once
// OIML R 111-1:2004 Table 5: the minimum and maximum density a weight of each class may have, by nominal value
// (rows ">= 100 g", 50 g, 20 g ... 20 mg; below 20 mg, and where a cell is empty, R 111 sets no limit). Some
// cells give only a lower limit. Transcribed from memory of the standard, NOT checked against the purchased
// text here (shared/reference-data has no copy of this table); doc/reference-weights.md says so, and a lab
// that knows its weights' density enters it instead (`weight set-properties --density --density-u`).
//
// The density a EURAMET cg-18 (v4.0, 7.1.2.2) buoyancy term uses for a weight of unknown density is derived
// from these limits as plumb's stated, conservative reading:
//   rho = 8000 kg/m3 (the conventional density of OIML D 28, inside every two-sided interval of the table),
//   u(rho) = max(rho_max - 8000, 8000 - rho_min) / sqrt 3, a rectangular distribution about 8000 that covers
//   the whole interval; with a lower limit only, the interval is taken as symmetric about 8000.
#include <optional>
#include <string>

#include "core/units.hpp"
#include "metrology/weight_classes.hpp"

namespace plumb::weights {

struct DensityLimits {
  double min_kg_m3 = 0.0;
  std::optional<double> max_kg_m3;  ///< none: Table 5 gives a lower limit only
};

/// The Table 5 limits for the class at the nominal value (the row of the largest tabulated nominal not above
/// it); nullopt where R 111 sets none.
std::optional<DensityLimits> density_limits(WeightClass c, ExactMass nominal);

struct ClassDensity {
  double rho_kg_m3 = 8000.0;
  double u_kg_m3 = 0.0;  ///< standard uncertainty
  DensityLimits limits;
  std::string basis;  ///< e.g. "OIML R 111-1:2004 Table 5, class E2, >= 100 g: 7810 to 8210 kg/m3, rectangular"
};

/// rho and u(rho) from the class limits as the header states; nullopt where Table 5 sets no limit.
std::optional<ClassDensity> density_from_class(WeightClass c, ExactMass nominal);

}  // namespace plumb::weights
