#pragma once
// The audit trail for an inspector: text to read, CSV for a spreadsheet, JSON for scripts.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "report/records/audit_line.hpp"
#include "store/audit_trail.hpp"

namespace plumb::report {

/// Plain text: one line per record (sequence, time, who, what, why), as report/records/audit_line.hpp writes it.
/// `authors` says who wrote each record (report/records/audit_line.hpp).
std::string audit_log_text(const std::string& scope, const std::vector<store::AuditRecord>& records,
                           const AuditAuthors& authors);
/// RFC 4180 CSV with a header row; every field complete. `user_id` is empty and `user` says why for a record
/// without one (written before user accounts, or not logged in).
std::string audit_log_csv(const std::vector<store::AuditRecord>& records, const AuditAuthors& authors);
/// {"scope": ..., "records": [...]} with before/after as JSON objects; every field complete; `user_id` null and
/// `user` saying why for a record without one.
nlohmann::json audit_log_json(const std::string& scope, const std::vector<store::AuditRecord>& records,
                              const AuditAuthors& authors);

}  // namespace plumb::report
