#pragma once
// Eccentricity test of a balance: one test load read at the centre of the pan and at four or more named
// off-centre positions (EURAMET cg-18 v4.0, 5.3; OIML R 76-1 A.4.7).
// Deviations from the centre reading are exact (Decimal). The contribution to the uncertainty of the
// error of indication at a load L follows EURAMET cg-18 (7.1.1.4, rectangular distribution):
//   u(delta_I_ecc)(L) = |Delta_I_ecc|max / (2 L_ecc) * L / sqrt(3)
// where |Delta_I_ecc|max is the largest |I_position - I_centre| and L_ecc the eccentricity test load.
#include <array>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/units.hpp"

namespace plumb::checks {

struct EccentricityPosition {
  std::string name;   ///< e.g. "front-left", "back", "2"
  ExactMass reading;  ///< exact, as displayed
};

struct EccentricityInput {
  ExactMass load;                        ///< L_ecc, the test load (conventional mass or nominal)
  std::optional<ExactMass> centre;       ///< the reading at the centre
  std::vector<EccentricityPosition> positions;  ///< >= 4 off-centre positions, distinct names
};

inline constexpr std::size_t min_eccentricity_positions = 4;

/// The places on the pan a run file may name: the centre, then the four quarters (corners) or the four edges,
/// where EURAMET cg-18 5.3 and OIML R 76-1 A.4.7 put the off-centre loads. A name outside this list (a typing
/// slip such as "middle" or "font-left") is refused rather than taken for one more position.
inline constexpr std::array<std::string_view, 9> pan_positions{
    "centre", "front-left", "front-right", "back-left", "back-right", "front", "back", "left", "right"};

struct EccentricityDeviation {
  std::string name;
  ExactMass reading;
  ExactMass deviation;  ///< reading - centre, exact
};

struct EccentricityResult {
  ExactMass load;
  ExactMass centre;
  std::vector<EccentricityDeviation> deviations;  ///< in input order
  ExactMass max_abs_deviation;                    ///< |Delta_I_ecc|max, exact
  std::string max_position;                       ///< first position where it occurs
  /// |Delta_I_ecc|max / L_ecc: the relative eccentricity error, scaled to other loads.
  double relative_max = 0.0;

  /// Half-width of the rectangular distribution at load L: |Delta|max / (2 L_ecc) * L.
  [[nodiscard]] Mass half_width_at(Mass load_at) const;
  /// EURAMET cg-18 standard uncertainty at load L: half_width_at(L) / sqrt(3).
  [[nodiscard]] Mass uncertainty_at(Mass load_at) const;
};

/// Throws InputError when the centre reading is missing, there are fewer than 4 positions, a position
/// has no name or is named twice (or is named "centre"), or the load is not positive.
EccentricityResult evaluate_eccentricity(const EccentricityInput& in);

}  // namespace plumb::checks
