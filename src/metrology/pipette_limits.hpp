#pragma once
// Limits for piston pipettes: the ISO 8655-2:2002 Table 1 maximum permissible errors, or a lab's own.
//
// The ISO 8655-2 rules applied here (as in reference-data/metrology/iso8655-2-pipette-mpe.csv):
// - the table gives, for each nominal volume, a systematic limit (|mean - selected| <= limit) and a random
//   limit (repeatability SD <= limit), in % of the nominal volume and in uL;
// - for a variable-volume pipette the absolute limits (uL) at the nominal volume apply at every selected
//   volume, so in % they widen as the selected volume falls;
// - for a multichannel pipette the limits are doubled.
//
// A nominal volume that is not a row of the table is refused (LimitsPolicy::Kind::iso8655_2 cannot be
// chosen for it): the lab enters its own limits, e.g. from the manufacturer's specification. Why not take
// a neighbouring row: the table here was transcribed from memory and gives no rule for volumes between rows;
// the next larger row would be looser than intended (a 300 uL pipette under the 500 uL row may err by
// 4.0 uL = 1.3 %) and the next smaller stricter (1.6 uL = 0.53 %); either would be a rule we invented, and a
// limit decides pass or fail on a certificate. A refusal at registration costs one line of input.
//
// A lab's own limits are taken as given: one pair for every selected volume, either in uL (|e_s| and s_r)
// or in % (|e_s| as % of the selected volume, and CV). They are not doubled for multichannel pipettes: a lab
// that wants wider multichannel limits enters them.
#include <optional>
#include <string>
#include <vector>

#include "core/decimal.hpp"
#include "core/units.hpp"

namespace plumb::pipette_limits {

/// One row of ISO 8655-2:2002 Table 1 (single-channel pipettes, at the nominal volume).
struct Iso8655Row {
  ExactVolume nominal;
  Decimal systematic_pct;
  ExactVolume systematic;
  Decimal random_pct;
  ExactVolume random;
};

/// The table, ascending by nominal volume. Source: ISO 8655-2:2002 Table 1, transcribed from memory.
const std::vector<Iso8655Row>& iso8655_2_table();
/// The row for exactly this nominal volume, if there is one.
std::optional<Iso8655Row> iso8655_2_row(ExactVolume nominal);

/// Which limits a pipette is judged by.
struct LimitsPolicy {
  enum class Kind { iso8655_2, lab_ul, lab_pct };
  Kind kind = Kind::iso8655_2;
  // A number in uL or in %, as `kind` says: the unit is the policy's, so these stay plain decimals.
  std::optional<Decimal> systematic;  ///< lab: limit on |systematic error|, in uL or % of the selected volume
  std::optional<Decimal> random;      ///< lab: limit on the random error, SD in uL or CV in %

  [[nodiscard]] std::string name() const;  ///< "ISO 8655-2:2002", "lab limits (uL)", "lab limits (%)"
  [[nodiscard]] std::string key() const;   ///< "iso8655-2", "lab-ul", "lab-pct"
};

/// The limits applied at one selected volume, in both uL and % of the selected volume.
struct AppliedLimits {
  LimitsPolicy::Kind kind = LimitsPolicy::Kind::iso8655_2;
  Volume systematic;            ///< limit on |mean volume - selected volume|
  Volume random;                ///< limit on the repeatability SD (lab %: the CV limit times the selected
                                ///< volume, for display only; the verdict then compares CV with random_pct)
  double systematic_pct = 0.0;  ///< systematic limit as % of the selected volume
  double random_pct = 0.0;      ///< random limit as % of the selected volume (a CV limit)
  bool compare_in_pct = false;  ///< lab % limits: judge e_s % and CV directly
  bool doubled = false;         ///< ISO limits doubled for a multichannel pipette
  std::string basis;            ///< one sentence for a certificate: where the limits come from
};

/// Throws InputError when the policy cannot be applied to a pipette of this nominal volume: an ISO 8655-2
/// policy for a nominal volume not in the table, or lab limits missing, zero or negative.
void validate_policy(const LimitsPolicy& policy, ExactVolume nominal);

/// The limits at `selected` for a pipette of volume `nominal` with `channels` channels. Validates the policy.
AppliedLimits limits_at(const LimitsPolicy& policy, ExactVolume nominal, ExactVolume selected, int channels);

}  // namespace plumb::pipette_limits
