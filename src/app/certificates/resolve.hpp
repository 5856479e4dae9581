#pragma once
// Certificate selectors as a person types them. Where a command means a certificate, LAST is the last
// certificate issued (not the certificate of the last run, which may have none yet); a run number names the
// certificate of that run. Run commands keep run selectors (app/runs/resolve.hpp), LAST there being the last
// run recorded.
#include <string>

#include "store/database.hpp"
#include "store/records.hpp"

namespace plumb::app {

/// A certificate by number (BC-2026-0001), LAST (the last issued) or run number (that run's certificate);
/// InputError naming the selector when there is no such certificate.
store::CertificateRecord resolve_certificate(store::Database& db, const std::string& selector);

}  // namespace plumb::app
