#pragma once
// One audit record as one line a person reads: "2026-11-30 09:12  A. Technician  recorded check run 7 on BAL-A
// (repeatability, 2026-11-30, pass; 10 readings)". Stored exact decimals are printed as text with their unit
// ("+0.03 mg"), never as the scaled integers they are kept as; free text (names, reasons, ids) is printed with its
// control characters escaped, so that no value can end the line and start a forged one.
#include <string>

#include "store/audit_trail.hpp"

namespace plumb::report {

/// "2026-11-30 09:12  WHO  WHAT[: why "REASON"]" (time in UTC, to the minute).
std::string audit_record_line(const store::AuditRecord& record);

/// What the record did, without time and person: "registered weight W100 (100g, class E2)".
std::string audit_record_what(const store::AuditRecord& record);

}  // namespace plumb::report
