#include "report/records/audit_log.hpp"

#include <fmt/format.h>

#include <sstream>

#include "core/text_field.hpp"
#include "report/format/csv.hpp"
#include "report/format/text.hpp"
#include "report/records/audit_line.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

json parsed_or_null(const std::optional<std::string>& text) {
  if (!text) return json();
  json j = json::parse(*text, nullptr, false);
  return j.is_discarded() ? json(*text) : j;
}

}  // namespace

// Every stored text is shown on one line (core/text_field.hpp): a name or reason recorded with a line break
// (by an older plumb, or written behind its back) cannot make the log show a record that is not there.
std::string audit_log_text(const std::string& scope, const std::vector<store::AuditRecord>& records,
                           const AuditAuthors& authors) {
  std::string out = fmt::format(
      "Audit trail of {}: {} record(s), times in UTC, each with the printed name and [login] of "
      "the user who wrote it (every column, the OS account and the hashes: --format csv or json)\n",
      printable(scope), records.size());
  for (const auto& r : records) out += fmt::format("#{:<6} {}\n", r.seq, audit_record_line(r, authors));
  return out;
}

std::string audit_log_csv(const std::vector<store::AuditRecord>& records, const AuditAuthors& authors) {
  std::ostringstream out;
  CsvWriter csv(out);
  csv.header({"seq", "at_utc", "actor", "user_id", "user", "os_user", "action", "table", "row_key", "reason",
              "before_json", "after_json", "prev_hash", "hash"});
  for (const auto& r : records) {
    csv.integer(r.seq).value(r.at).text(r.actor);
    if (r.user_id)
      csv.integer(*r.user_id);
    else
      csv.value("");
    csv.text(audit_record_author(r, authors)).text(r.os_user).value(r.action).value(r.table_name);
    csv.value(r.row_key).text(r.reason.value_or("")).text(r.before_json.value_or("")).text(r.after_json.value_or(""));
    csv.value(r.prev_hash).value(r.hash);
    csv.end_row();
  }
  return out.str();
}

namespace {

/// What the record says was inserted: the row, or for "insert rows" each table's rows as objects (the
/// stored form lists the column names once per table).
json after_of(const store::AuditRecord& r) {
  if (r.action != "insert rows") return parsed_or_null(r.after_json);
  json tables = json::object();
  for (auto& [table, row] : store::recorded_rows(r)) tables[table].push_back(std::move(row));
  return tables;
}

}  // namespace

json audit_log_json(const std::string& scope, const std::vector<store::AuditRecord>& records,
                    const AuditAuthors& authors) {
  json list = json::array();
  for (const auto& r : records)
    list.push_back({{"seq", r.seq},
                    {"at", r.at},
                    {"actor", r.actor},
                    {"user_id", r.user_id ? json(*r.user_id) : json()},
                    {"user", audit_record_author(r, authors)},
                    {"os_user", r.os_user},
                    {"action", r.action},
                    {"table", r.table_name},
                    {"row_key", r.row_key},
                    {"reason", r.reason ? json(*r.reason) : json()},
                    {"before", parsed_or_null(r.before_json)},
                    {"after", after_of(r)},
                    {"prev_hash", r.prev_hash},
                    {"hash", r.hash}});
  return {{"scope", scope}, {"records", list}};
}

}  // namespace plumb::report
