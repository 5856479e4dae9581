#pragma once
// The certificate list and the approval queue: plain rows the app layer fills (app/certificates/list.hpp),
// rendered as aligned text, CSV (report/format/csv.hpp) and JSON.
#include <cstdint>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "core/dates.hpp"

namespace plumb::report {

struct CertificateListItem {
  std::string number;
  std::int64_t run_id = 0;
  std::string instrument;
  std::string procedure;  ///< its key, e.g. "repeatability"
  Date check_date;
  std::string operator_name;  ///< who performed the check (cannot approve it)
  std::string issued_at;      ///< UTC, ISO 8601
  std::string issued_by;
  std::string state;  ///< "draft", "approved", "superseded", "withdrawn"
  std::optional<std::string> approved_by, approved_at;
  std::optional<std::string> superseded_at, replaced_by;
  std::optional<std::string> withdrawn_at, withdrawn_reason;
  std::optional<int> waiting_days;  ///< the approval queue: days since issue
};

/// `scope` says what was asked for, e.g. "state draft, instrument BAL-A" (empty: every certificate).
std::string certificate_list_text(const std::vector<CertificateListItem>& items, const std::string& scope);
std::string certificate_list_csv(const std::vector<CertificateListItem>& items);
nlohmann::json certificate_list_json(const std::vector<CertificateListItem>& items);

/// The drafts waiting for a reviewer on `on`, oldest first, with how long each has waited.
std::string approval_queue_text(const std::vector<CertificateListItem>& items, Date on);
std::string approval_queue_csv(const std::vector<CertificateListItem>& items);
nlohmann::json approval_queue_json(const std::vector<CertificateListItem>& items, Date on);

}  // namespace plumb::report
