#include "report/certificates/text.hpp"

#include <fmt/format.h>

#include "checks/procedure.hpp"
#include "core/errors.hpp"
#include "report/calibration/certificate_text.hpp"
#include "report/pipette/certificate_text.hpp"
#include "report/weekly_check/certificate_text.hpp"

namespace plumb::report {

std::string certificate_text(const nlohmann::json& c, const std::string& content_sha256) {
  const std::string kind = c.value("kind", "");
  const auto procedure = checks::procedure_of_certificate_kind(kind);
  if (!procedure) throw StorageError(fmt::format("certificate {} is of an unknown kind \"{}\".", c.value("number", ""), kind));
  switch (*procedure) {
    case checks::Procedure::repeatability: return balance_check_certificate_text(c, content_sha256);
    case checks::Procedure::calibration: return calibration_certificate_text(c, content_sha256);
    case checks::Procedure::gravimetric: return pipette_certificate_text(c, content_sha256);
  }
  return {};
}

}  // namespace plumb::report
