#pragma once
// Review and approval of certificates. A certificate is a draft until someone other than the operator of
// its check run approves it (name, date, meaning of the signature); it is superseded when a correction of
// its run issues a replacement. Its stored content never changes: the status is read from append-only
// events and shown beside the content.
#include <nlohmann/json.hpp>
#include <string>

#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::app {

/// {"state": "draft"|"approved"|"superseded"|"withdrawn", "approval": {...}|null, "superseded": {...}|null,
///  "withdrawn": {...}|null, "replaces": NUMBER|null, "replaces_reason": TEXT (with "replaces")}
///  (app/certificates/state.hpp says which state wins). Not covered by content_sha256: it is the certificate's standing
///  today.
nlohmann::json certificate_status(store::Database& db, const store::CertificateRecord& c);

/// What renderers (text, JSON, PDF) receive: the stored content plus "content_sha256" and "status".
nlohmann::json certificate_document(store::Database& db, const store::CertificateRecord& c);

/// Records the approval of the certificate `selector` (number, LAST or run number: app/certificates/resolve.hpp)
/// by `actor` with the meaning of the signature. InputError (nothing written) when the approver is the run's
/// operator, the certificate is already approved, has been withdrawn or superseded, or the meaning is empty.
store::CertificateRecord approve_certificate(store::Database& db, const store::Actor& actor,
                                             const std::string& selector, const std::string& meaning);

/// True when two names as given denote the same person: compared ignoring case and surrounding or repeated
/// spaces (plumb does not authenticate people; this only stops the obvious self-approval).
bool same_person(const std::string& a, const std::string& b);

}  // namespace plumb::app
