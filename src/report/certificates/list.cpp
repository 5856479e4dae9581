#include "report/certificates/list.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <sstream>

#include "report/format/csv.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

/// Columns as wide as their widest cell (header included), two spaces apart; numbers right-aligned.
class AlignedTable {
 public:
  AlignedTable(std::vector<std::string> headers, std::vector<bool> right)
      : rows_{std::move(headers)}, right_(std::move(right)) {}
  void add(std::vector<std::string> row) { rows_.push_back(std::move(row)); }
  [[nodiscard]] std::string text(const std::string& indent) const {
    std::vector<std::size_t> width(right_.size(), 0);
    for (const auto& row : rows_)
      for (std::size_t i = 0; i < row.size(); ++i) width[i] = std::max(width[i], row[i].size());
    std::string out;
    for (const auto& row : rows_) {
      std::string line = indent;
      for (std::size_t i = 0; i < row.size(); ++i) {
        const bool last = i + 1 == row.size();
        if (right_[i])
          line += fmt::format("{:>{}}", row[i], width[i]);
        else
          line += last ? row[i] : fmt::format("{:<{}}", row[i], width[i]);
        if (!last) line += "  ";
      }
      out += line + "\n";
    }
    return out;
  }

 private:
  std::vector<std::vector<std::string>> rows_;
  std::vector<bool> right_;
};

std::string issue_date(const CertificateListItem& c) {
  return c.issued_at.substr(0, 10);
}

std::string waited(int days) {
  if (days <= 0) return "issued today";
  return days == 1 ? "1 day" : fmt::format("{} days", days);
}

json optional_json(const std::optional<std::string>& s) {
  return s ? json(*s) : json();
}

json item_json(const CertificateListItem& c) {
  json j = json::object();
  j["number"] = c.number;
  j["instrument"] = c.instrument;
  j["procedure"] = c.procedure;
  j["run_id"] = c.run_id;
  j["check_date"] = to_string(c.check_date);
  j["operator"] = c.operator_name;
  j["issued_at"] = c.issued_at;
  j["issued_by"] = c.issued_by;
  j["state"] = c.state;
  j["approved_by"] = optional_json(c.approved_by);
  j["approved_at"] = optional_json(c.approved_at);
  j["superseded_at"] = optional_json(c.superseded_at);
  j["replaced_by"] = optional_json(c.replaced_by);
  j["withdrawn_at"] = optional_json(c.withdrawn_at);
  j["withdrawn_reason"] = optional_json(c.withdrawn_reason);
  return j;
}

}  // namespace

std::string certificate_list_text(const std::vector<CertificateListItem>& items, const std::string& scope) {
  std::string out = fmt::format("Certificates{}: {}\n", scope.empty() ? "" : " (" + scope + ")", items.size());
  if (items.empty()) return out + "  none matches.\n";
  AlignedTable t({"number", "instrument", "procedure", "run", "check date", "issued", "state", "approved by"},
                 {false, false, false, true, false, false, false, false});
  for (const auto& c : items)
    t.add({c.number, c.instrument, c.procedure, std::to_string(c.run_id), to_string(c.check_date), issue_date(c),
           c.replaced_by ? c.state + " by " + *c.replaced_by : c.state, c.approved_by.value_or("-")});
  return out + t.text("  ");
}

std::string certificate_list_csv(const std::vector<CertificateListItem>& items) {
  std::ostringstream out;
  CsvWriter csv(out);
  csv.header({"number", "instrument", "procedure", "run_id", "check_date", "operator", "issued_at", "issued_by",
              "state", "approved_by", "approved_at", "replaced_by", "withdrawn_reason"});
  for (const auto& c : items) {
    csv.value(c.number).value(c.instrument).value(c.procedure).integer(c.run_id).value(to_string(c.check_date));
    csv.text(c.operator_name).value(c.issued_at).text(c.issued_by).value(c.state);
    c.approved_by ? csv.text(*c.approved_by) : csv.empty();
    c.approved_at ? csv.value(*c.approved_at) : csv.empty();
    c.replaced_by ? csv.value(*c.replaced_by) : csv.empty();
    c.withdrawn_reason ? csv.text(*c.withdrawn_reason) : csv.empty();
    csv.end_row();
  }
  return out.str();
}

json certificate_list_json(const std::vector<CertificateListItem>& items) {
  json list = json::array();
  for (const auto& c : items) list.push_back(item_json(c));
  return list;
}

std::string approval_queue_text(const std::vector<CertificateListItem>& items, Date on) {
  std::string out =
      fmt::format("Awaiting approval on {}: {} draft certificate(s), oldest first\n", to_string(on), items.size());
  if (items.empty()) return out + "  nothing waits for a reviewer.\n";
  AlignedTable t({"number", "instrument", "procedure", "run", "check date", "issued", "waiting", "performed by"},
                 {false, false, false, true, false, false, false, false});
  for (const auto& c : items)
    t.add({c.number, c.instrument, c.procedure, std::to_string(c.run_id), to_string(c.check_date), issue_date(c),
           waited(c.waiting_days.value_or(0)), c.operator_name});
  out += t.text("  ");
  out +=
      "Approve one, logged in as a reviewer, with `plumb certificate approve NUMBER --meaning \"reviewed and "
      "approved\"`;\nthe reviewer must be someone other than the user who recorded or corrected the check.\n";
  return out;
}

std::string approval_queue_csv(const std::vector<CertificateListItem>& items) {
  std::ostringstream out;
  CsvWriter csv(out);
  csv.header({"number", "instrument", "procedure", "run_id", "check_date", "operator", "issued_at", "issued_by",
              "waiting_days"});
  for (const auto& c : items) {
    csv.value(c.number).value(c.instrument).value(c.procedure).integer(c.run_id).value(to_string(c.check_date));
    csv.text(c.operator_name).value(c.issued_at).text(c.issued_by).integer(c.waiting_days.value_or(0));
    csv.end_row();
  }
  return out.str();
}

json approval_queue_json(const std::vector<CertificateListItem>& items, Date on) {
  json list = json::array();
  for (const auto& c : items) {
    json j = item_json(c);
    j["waiting_days"] = c.waiting_days.value_or(0);
    list.push_back(std::move(j));
  }
  return {{"on", to_string(on)}, {"items", list}};
}

}  // namespace plumb::report
