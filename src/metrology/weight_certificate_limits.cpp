#include "metrology/weight_certificate_limits.hpp"

#include <algorithm>

#include "core/errors.hpp"

namespace plumb::weights {
namespace {

/// a * 10^-sa compared with b * 10^-sb, both brought to the finer scale in 128 bits.
bool at_most(Int128 a, int sa, Int128 b, int sb) {
  const int s = std::max(sa, sb);
  if (s - sa > 30 || s - sb > 30) throw StorageError("a certificate value has too many decimals to compare exactly.");
  return a * pow10_i128(s - sa) <= b * pow10_i128(s - sb);
}

}  // namespace

CertificateAgainstClass judge_certificate(WeightClass c, ExactMass nominal, ExactMass correction, ExactMass uncertainty,
                                          Decimal k) {
  CertificateAgainstClass out;
  out.mpe = mpe(c, nominal);
  if (!out.mpe) return out;
  out.correction_within = abs(correction) <= *out.mpe;
  const Decimal u = uncertainty.in_grams();
  const Decimal m = out.mpe->in_grams();
  // 6 U <= k MPE, all in grams.
  out.uncertainty_within =
      at_most(Int128{6} * u.units(), u.scale(), Int128{k.units()} * m.units(), k.scale() + m.scale());
  return out;
}

double uncertainty_for_k2_mg(ExactMass uncertainty, Decimal k) {
  return uncertainty.approx().mg() * 2.0 / k.to_double();
}

}  // namespace plumb::weights
