#include "app/certificates/dcc_export.hpp"

#include "app/certificates/resolve.hpp"
#include "app/certificates/review.hpp"

namespace plumb::app {

std::string certificate_dcc(store::Database& db, const std::string& selector, const report::dcc::DccOptions& options) {
  const store::CertificateRecord c = resolve_certificate(db, selector);
  return report::dcc::certificate_dcc(certificate_document(db, c), options);
}

}  // namespace plumb::app
