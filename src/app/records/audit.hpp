#pragma once
// The audit trail for an inspector: who did what, when and why, for the whole lab, one instrument or one
// certificate; and the proof that nothing was changed behind plumb's back.
#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include "report/records/audit_line.hpp"
#include "store/audit_trail.hpp"
#include "store/database.hpp"

namespace plumb::app {

struct AuditLogFilter {
  std::optional<std::string> instrument;   ///< an instrument id
  std::optional<std::string> certificate;  ///< a certificate number (or run number / LAST)
  std::optional<std::string> from, to;     ///< --from / --to: UTC dates, YYYY-MM-DD, inclusive
  std::optional<std::string> author;       ///< --author: only the records written by this user account (its login)
  std::optional<std::int64_t> newest;      ///< only the last N records (of the lab: with no other filter)
  /// Of an instrument: only records older than the record of this sequence number (a page further back).
  std::optional<std::string> before;
};

struct AuditLog {
  std::string scope;  ///< "the whole lab", "instrument BAL-A", "certificate BC-2026-0001"
  std::vector<store::AuditRecord> records;
  report::AuditAuthors authors;  ///< who wrote each record
  std::int64_t total = 0;         ///< records in the scope before `newest` kept only the last ones
  bool older = false;             ///< records older than the first one kept are in the scope (another page)
};

/// The records of the trail that concern the filter's subject, in order. An instrument's records are its
/// own rows, every row naming it (instrument_id), its runs and their rows (run_id), their certificates and
/// their events (certificate_id), and its retire/reinstate events, found through the trail's index of rows
/// (store/item_trail.hpp) without reading the rest of the trail. A certificate's records are its run with
/// the run's rows, the certificate, its events and the certificate that replaces it.
/// --from, --to and --author narrow any of these further; InputError naming the option for a malformed date, a
/// period that ends before it starts, or a login that names no account.
AuditLog audit_log(store::Database& db, const AuditLogFilter& filter);

struct VerifyRequest {
  std::optional<std::string> public_key;  ///< --public-key: PEM file of the lab's public key
  std::optional<std::string> since;       ///< --since: a checkpoint exported earlier
};

struct Verification {
  store::AuditVerification audit;
  std::string key_source;        ///< which key the checkpoints were proved with, for the user
  bool independent_key = false;  ///< that key came from outside the database
};

/// Verifies the trail of the database (see store::verify_audit_trail). The checkpoints are proved with the public
/// key given; without one, with the lab's key file when it can be read; otherwise only with the key each
/// checkpoint names (which proves them unaltered, not who signed them). InputError naming the option for a file
/// that is missing or not what it should be.
Verification verify_audit(store::Database& db, const VerifyRequest& request = {});

/// Writes the latest signed checkpoint to `file` as JSON (mode 0600, replaced whole). InputError when the database
/// has none.
store::Checkpoint export_checkpoint(store::Database& db, const std::filesystem::path& file);

}  // namespace plumb::app
