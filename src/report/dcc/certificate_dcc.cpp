#include "report/dcc/certificate_dcc.hpp"

#include <fmt/format.h>

#include "checks/procedure.hpp"
#include "core/errors.hpp"
#include "report/dcc/parts.hpp"
#include "report/dcc/xml_tree.hpp"

namespace plumb::report::dcc {

std::string certificate_dcc(const nlohmann::json& doc, const DccOptions& options) {
  const std::string kind = doc.value("kind", "");
  const auto procedure = checks::procedure_of_certificate_kind(kind);
  if (!procedure)
    throw StorageError(fmt::format("certificate {} is of an unknown kind \"{}\".", doc.value("number", ""), kind));
  XmlDoc xml = new_dcc_document();
  xmlNodePtr root = xmlDocGetRootElement(xml.get());
  add_administrative_data(root, doc, options);
  xmlNodePtr results = add(root, "measurementResults");
  switch (*procedure) {
    case checks::Procedure::repeatability:
      add_weekly_check_results(results, doc);
      break;
    case checks::Procedure::calibration:
      add_calibration_results(results, doc);
      break;
    case checks::Procedure::gravimetric:
      add_pipette_results(results, doc);
      break;
  }
  return to_xml_text(xml.get());
}

}  // namespace plumb::report::dcc
