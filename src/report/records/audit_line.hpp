#pragma once
// One audit record as one line a person reads: "2026-11-30 09:12  A. Technician [atech]  recorded check run 7 on BAL-A
// (repeatability, 2026-11-30, pass; 10 readings)". Stored exact decimals are printed as text with their unit
// ("+0.03 mg"), never as the scaled integers they are kept as; free text (names, reasons, ids) is printed with its
// control characters escaped, so that no value can end the line and start a forged one.
#include <cstdint>
#include <map>
#include <optional>
#include <string>

#include "store/audit_trail.hpp"

namespace plumb::report {

/// Who wrote the records of a trail: each account's login by user id, and the first record an account wrote.
/// Records before that one have no user id because the database had no accounts yet; after it, a record without
/// one was written with nobody authenticated (a failed log-in).
struct AuditAuthors {
  std::map<std::int64_t, std::string> logins;
  std::optional<std::int64_t> first_account_seq;
};

/// Who wrote a record: the login of its account ("ines"), "written before user accounts", "not logged in", or
/// the user id when no account of the database has it (a record written behind plumb's back).
std::string audit_record_author(const store::AuditRecord& record, const AuditAuthors& authors);

/// "2026-11-30 09:12  WHO [LOGIN]  WHAT[: why "REASON"]" (time in UTC, to the minute).
std::string audit_record_line(const store::AuditRecord& record, const AuditAuthors& authors);

/// What the record did, without time and person: "registered weight W100 (100g, class E2)".
std::string audit_record_what(const store::AuditRecord& record);

}  // namespace plumb::report
