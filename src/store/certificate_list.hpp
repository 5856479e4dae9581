#pragma once
// Certificates as a list: each with its run and the events of its standing (approval, supersession,
// withdrawal), read in one query for the whole lab rather than a look-up per certificate.
#include <SQLiteCpp/Database.h>

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "checks/procedure.hpp"
#include "core/dates.hpp"
#include "store/records.hpp"

namespace plumb::store {

struct CertificateListRow {
  std::int64_t id = 0;
  std::string number;
  std::int64_t run_id = 0;
  std::string instrument_id;
  checks::Procedure procedure = checks::Procedure::repeatability;
  Date performed_on;
  std::string operator_name;
  std::string issued_at;  ///< UTC, ISO 8601
  std::string issued_by;
  std::optional<std::string> approved_by, approved_at;
  std::optional<std::string> superseded_at, replaced_by;  ///< replaced_by: the replacing certificate's number
  std::optional<std::string> withdrawn_at, withdrawn_reason;
};

/// What narrows the list in the query itself; the standing is judged by the caller from the events.
struct CertificateListQuery {
  std::optional<std::string> instrument_id;
  std::optional<Date> issued_from, issued_to;  ///< inclusive, on the UTC date of issue
};

/// Every certificate that matches, oldest issued first (by issue time, then id).
std::vector<CertificateListRow> list_certificates(SQLite::Database& db, const CertificateListQuery& query);

/// The certificate issued last (highest id), if any.
std::optional<CertificateRecord> last_certificate(SQLite::Database& db);

}  // namespace plumb::store
