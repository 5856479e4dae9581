#include "report/records/audit_line.hpp"

#include <fmt/format.h>

#include <map>

#include "core/errors.hpp"
#include "core/units.hpp"
#include "report/format/text.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

/// A column as escaped text; "" when absent or null.
std::string text_of(const json& row, const char* column) {
  if (!row.contains(column) || row[column].is_null()) return "";
  const json& v = row[column];
  return printable(v.is_string() ? v.get<std::string>() : v.dump());
}

/// A stored exact decimal in grams as a mass with its unit ("0.00003" -> "0.03 mg"); signed when asked.
std::string grams_of(const json& row, const char* column, bool with_sign = false) {
  const std::string stored = row.contains(column) && row[column].is_string() ? row[column].get<std::string>() : "";
  if (stored.empty()) return "";
  try {
    const std::string mass = ExactMass::parse(stored, column, MassUnit::g).to_string();
    return with_sign && mass.front() != '-' ? "+" + mass : mass;
  } catch (const InputError&) {
    return printable(stored) + " g";  // not a decimal: shown as stored rather than hidden
  }
}

std::string describe_row(const std::string& table, const json& row, const std::map<std::string, std::size_t>& counts) {
  if (table == "lab") return fmt::format("created the lab \"{}\"", text_of(row, "name"));
  if (table == "weights")
    return fmt::format("registered weight {} ({}, class {})", text_of(row, "id"), text_of(row, "nominal_text"),
                       text_of(row, "weight_class"));
  if (table == "weight_calibrations")
    return fmt::format("recorded certificate {} of weight {}: correction {}, U {} (k = {}), calibrated {}, due {}",
                       text_of(row, "certificate_no"), text_of(row, "weight_id"), grams_of(row, "correction_g", true),
                       grams_of(row, "uncertainty_g"), text_of(row, "coverage_k"), text_of(row, "calibrated_on"),
                       text_of(row, "due_on"));
  if (table == "instruments")
    return fmt::format("registered {} {} (checked every {}{})", text_of(row, "kind"), text_of(row, "id"),
                       text_of(row, "check_every"),
                       text_of(row, "location").empty() ? "" : ", at \"" + text_of(row, "location") + "\"");
  if (table == "balances")
    return fmt::format("set balance {}: capacity {}, d = {}, policy {}", text_of(row, "instrument_id"),
                       grams_of(row, "capacity_g"), grams_of(row, "readability_g"), text_of(row, "policy"));
  if (table == "pipettes")
    return fmt::format("set pipette {}: {} {} uL, {} channel(s), limits {}", text_of(row, "instrument_id"),
                       text_of(row, "volume_kind"), text_of(row, "nominal_ul"), text_of(row, "channels"),
                       text_of(row, "limits_policy"));
  if (table == "check_runs") {
    std::string what =
        fmt::format("recorded check run {} on {} ({}, {}, {}", text_of(row, "id"), text_of(row, "instrument_id"),
                    text_of(row, "procedure"), text_of(row, "performed_on"), text_of(row, "verdict"));
    if (!text_of(row, "supersedes").empty()) what += ", supersedes run " + text_of(row, "supersedes");
    std::size_t readings = 0;
    for (const char* t : {"readings", "calibration_readings"})
      if (const auto it = counts.find(t); it != counts.end()) readings += it->second;
    if (readings) what += fmt::format("; {} readings", readings);
    return what + ")";
  }
  if (table == "certificates")
    return fmt::format(
        "issued certificate {} for run {}{}", text_of(row, "number"), text_of(row, "run_id"),
        text_of(row, "supersedes").empty() ? "" : ", replacing certificate id " + text_of(row, "supersedes"));
  if (table == "certificate_events")
    return fmt::format("{} certificate id {}{}", text_of(row, "event"), text_of(row, "certificate_id"),
                       text_of(row, "meaning").empty() ? "" : " (" + text_of(row, "meaning") + ")");
  if (table == "service_events")
    return fmt::format("{} {} {}", text_of(row, "event"), text_of(row, "item_kind"), text_of(row, "item_id"));
  if (table == "balance_calibration_settings")
    return fmt::format("set the calibration of {}: tolerance {}, decision rule {}, every {}",
                       text_of(row, "instrument_id"), text_of(row, "tolerance"), text_of(row, "decision_rule"),
                       text_of(row, "calibrate_every"));
  if (table == "balance_in_use_terms")
    return fmt::format("set the terms of normal use of {}: form {}, required accuracy {} %, safety factor {}",
                       text_of(row, "balance_id"), text_of(row, "form"), text_of(row, "required_accuracy_pct"),
                       text_of(row, "safety_factor"));
  if (table == "pipette_editions")
    return fmt::format("chose ISO 8655:{} for pipette {}", text_of(row, "edition"), text_of(row, "pipette_id"));
  if (table == "lab_pipette_editions")
    return fmt::format("chose ISO 8655:{} as the lab's default for pipettes", text_of(row, "edition"));
  if (table == "run_voids") return fmt::format("voided run {}", text_of(row, "run_id"));
  if (table == "certificate_withdrawals")
    return fmt::format("withdrew certificate id {}", text_of(row, "certificate_id"));
  if (table == "users")
    return fmt::format("added user {} \"{}\" (user id {})", text_of(row, "login"), text_of(row, "full_name"),
                       text_of(row, "id"));
  if (table == "passwords")
    return fmt::format("set the password of user id {}{}", text_of(row, "user_id"),
                       text_of(row, "must_change") == "1" ? " (temporary: to be changed at the next log-in)" : "");
  if (table == "account_events")
    return fmt::format("{} user id {}{}", text_of(row, "event"), text_of(row, "user_id"),
                       text_of(row, "role").empty() ? "" : ": " + text_of(row, "role"));
  if (table == "security_settings")
    return fmt::format(
        "set the password rules: at least {} characters, lock after {} failed log-ins, sessions end "
        "after {} minutes idle",
        text_of(row, "min_password_length"), text_of(row, "max_failed_logins"), text_of(row, "idle_minutes"));
  if (table == "sessions") return fmt::format("logged in as user id {}", text_of(row, "user_id"));
  if (table == "session_ends")
    return fmt::format("ended session {} ({})", text_of(row, "session_id"), text_of(row, "why"));
  if (table == "signatures")
    return fmt::format("signed {} {} as \"{}\" ({}, user id {})", text_of(row, "table_name"), text_of(row, "row_key"),
                       text_of(row, "meaning"), text_of(row, "printed_name"), text_of(row, "user_id"));
  return "";
}

}  // namespace

std::string audit_record_what(const store::AuditRecord& record) {
  const auto rows = store::recorded_rows(record);
  std::map<std::string, std::size_t> counts;
  for (const auto& r : rows) ++counts[r.table];
  // The first row a record writes is what the command did (a run before its readings); the rest belong to it.
  for (const auto& r : rows)
    if (r.table == record.table_name)
      if (std::string what = describe_row(r.table, r.row, counts); !what.empty()) return what;
  std::string what =
      fmt::format("{} {} {}", printable(record.action), printable(record.table_name), printable(record.row_key));
  if (rows.size() > 1) what += fmt::format(" (and {} more rows)", rows.size() - 1);
  return what;
}

std::string audit_record_author(const store::AuditRecord& record, const AuditAuthors& authors) {
  if (!record.user_id)
    return authors.first_account_seq && record.seq > *authors.first_account_seq ? "not logged in"
                                                                                : "written before user accounts";
  const auto login = authors.logins.find(*record.user_id);
  return login == authors.logins.end() ? fmt::format("user id {}, not an account of this database", *record.user_id)
                                       : printable(login->second);
}

std::string audit_record_line(const store::AuditRecord& record, const AuditAuthors& authors) {
  // "2026-11-30T09:12:45Z" -> "2026-11-30 09:12"
  std::string at = record.at.size() >= 16 ? record.at.substr(0, 10) + " " + record.at.substr(11, 5) : record.at;
  std::string out = fmt::format("{}  {} [{}]  {}", printable(at), printable(record.actor),
                                audit_record_author(record, authors), audit_record_what(record));
  if (record.reason && !record.reason->empty()) out += fmt::format(": why \"{}\"", printable(*record.reason));
  return out;
}

}  // namespace plumb::report
