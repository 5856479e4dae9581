#include "app/registry/weight_certificate.hpp"

#include <fmt/format.h>

#include <cmath>

#include "app/registry/fields.hpp"
#include "core/errors.hpp"
#include "metrology/weight_certificate_limits.hpp"

namespace plumb::app {
namespace {

constexpr const char* standard = "OIML R 111-1:2004";
constexpr const char* override_hint =
    "check the certificate, or give --override-reason to record why the lab accepts it";

bool blank(const std::string& s) {
  return s.find_first_not_of(" \t") == std::string::npos;
}

}  // namespace

store::WeightCalibration parse_weight_certificate(const WeightCertificateInput& in, ExactMass nominal) {
  store::WeightCalibration c;
  validate_free_text(in.certificate, "--certificate", false);
  if (blank(in.certificate)) throw InputError("--certificate must give the weight's calibration certificate number.");
  c.certificate_no = in.certificate;
  c.correction = ExactMass::parse(in.correction, "--correction");
  c.uncertainty = positive_mass(in.uncertainty, "--uncertainty");
  c.k = Decimal::parse(in.k, "--k");
  if (c.k.to_double() < 1 || c.k.to_double() > 10)
    throw InputError(fmt::format("--k \"{}\" is not a plausible coverage factor (1 to 10).", in.k));
  c.calibrated_on = parse_date(in.calibrated, "--calibrated");
  c.due_on = parse_date(in.due, "--due");
  if (days_between(c.calibrated_on, c.due_on) <= 0)
    throw InputError(fmt::format("--due {} is not after --calibrated {}.", in.due, in.calibrated));
  if (std::abs(c.correction.in_grams().to_double()) > 0.01 * nominal.in_grams().to_double())
    throw InputError(fmt::format("--correction {} is more than 1 % of the nominal value {}; check the unit.",
                                 in.correction, nominal.to_string()));
  return c;
}

std::optional<store::WeightClassOverride> judge_against_class(const store::WeightRecord& weight,
                                                              const store::WeightCalibration& certificate,
                                                              const WeightCertificateInput& typed) {
  const weights::WeightClass cls = weights::parse_weight_class(weight.weight_class, "--class");
  const auto verdict =
      weights::judge_certificate(cls, weight.nominal, certificate.correction, certificate.uncertainty, certificate.k);
  const std::string where = fmt::format("class {} at {}", weight.weight_class, weight.nominal.to_string());
  if (typed.override_reason && blank(*typed.override_reason))
    throw InputError("--override-reason must say why the lab accepts a certificate outside its weight's class.");
  if (verdict.within()) {
    if (typed.override_reason)
      throw InputError(
          fmt::format("--override-reason is given, but certificate {} of weight {} meets the {} limits "
                      "of {}; there is nothing to override.",
                      certificate.certificate_no, weight.id, standard, where));
    return std::nullopt;
  }

  store::WeightClassOverride o;
  o.weight_class = weight.weight_class;
  o.mpe = verdict.mpe;
  if (!verdict.mpe) {
    o.beyond = "no MPE";
    if (!typed.override_reason)
      throw InputError(
          fmt::format("weight {}: {} Table 1 gives no MPE for {}, so its certificate cannot be checked "
                      "against its class; give --override-reason to record why the lab accepts it.",
                      weight.id, standard, where));
  } else if (!verdict.correction_within) {
    o.beyond = verdict.uncertainty_within ? "correction" : "correction and uncertainty";
    if (!typed.override_reason)
      throw InputError(fmt::format("--correction {} of weight {} is beyond the {} MPE for {} ({}); {}.",
                                   typed.correction, weight.id, standard, where, verdict.mpe->to_string(),
                                   override_hint));
  } else {
    o.beyond = "uncertainty";
    if (!typed.override_reason) {
      const double k2 = weights::uncertainty_for_k2_mg(certificate.uncertainty, certificate.k);
      const std::string for_k2 =
          certificate.k == Decimal(2, 0) ? "" : fmt::format(" (k = {}, so {:.3g} mg for k = 2)", typed.k, k2);
      throw InputError(
          fmt::format("--uncertainty {}{} of weight {} is more than a third of the {} MPE for {} ({} / 3 "
                      "= {:.3g} mg); {}.",
                      typed.uncertainty, for_k2, weight.id, standard, where, verdict.mpe->to_string(),
                      verdict.mpe->approx().mg() / 3.0, override_hint));
    }
  }
  o.reason = *typed.override_reason;
  return o;
}

}  // namespace plumb::app
