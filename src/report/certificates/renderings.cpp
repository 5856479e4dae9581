#include "report/certificates/renderings.hpp"

#include "report/certificates/document.hpp"
#include "report/document/html.hpp"
#include "report/document/text.hpp"
#include "report/document/values.hpp"

namespace plumb::report {

std::string certificate_text(const nlohmann::json& shown) {
  return render_text(certificate_document(shown));
}

std::string certificate_html(const nlohmann::json& shown) {
  return render_html(certificate_document(shown));
}

nlohmann::json certificate_json(const nlohmann::json& shown) {
  nlohmann::json out = shown;
  out["rendering"] = document_values(certificate_document(shown));
  return out;
}

}  // namespace plumb::report
