#pragma once
// The audit trail for an inspector: text to read, CSV for a spreadsheet, JSON for scripts.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "store/audit_trail.hpp"

namespace plumb::report {

/// Plain text: one line per record (sequence, time, who, what, why), as report/records/audit_line.hpp writes it.
std::string audit_log_text(const std::string& scope, const std::vector<store::AuditRecord>& records);
/// RFC 4180 CSV with a header row; every field complete.
std::string audit_log_csv(const std::vector<store::AuditRecord>& records);
/// {"scope": ..., "records": [...]} with before/after as JSON objects; every field complete.
nlohmann::json audit_log_json(const std::string& scope, const std::vector<store::AuditRecord>& records);

}  // namespace plumb::report
