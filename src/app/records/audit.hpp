#pragma once
// The audit trail for an inspector: who did what, when and why, for the whole lab, one instrument or one
// certificate; and the proof that nothing was changed behind plumb's back.
#include <optional>
#include <string>
#include <vector>

#include "store/audit_trail.hpp"
#include "store/database.hpp"

namespace plumb::app {

struct AuditLogFilter {
  std::optional<std::string> instrument;   ///< an instrument id
  std::optional<std::string> certificate;  ///< a certificate number (or run number / LAST)
  std::optional<std::string> from, to;     ///< --from / --to: UTC dates, YYYY-MM-DD, inclusive
  std::optional<std::string> by;           ///< --by: only the records of this person (the name as recorded)
};

struct AuditLog {
  std::string scope;  ///< "the whole lab", "instrument BAL-A", "certificate BC-2026-0001"
  std::vector<store::AuditRecord> records;
};

/// The records of the trail that concern the filter's subject, in order. An instrument's records are its
/// own rows, every row naming it (instrument_id), its runs and their rows (run_id), their certificates and
/// their events (certificate_id), and its retire/reinstate events. A certificate's records are its run with
/// the run's rows, the certificate, its events and the certificate that replaces it.
/// --from, --to and --by narrow any of these further; InputError naming the option for a malformed date, a
/// period that ends before it starts, or an empty name.
AuditLog audit_log(store::Database& db, const AuditLogFilter& filter);

/// Verifies the trail of the database (see store::verify_audit_trail).
store::AuditVerification verify_audit(store::Database& db);

}  // namespace plumb::app
