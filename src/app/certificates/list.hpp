#pragma once
// Certificates as a reviewer and an auditor look for them: the list with filters (state, instrument, issue
// date) and the approval queue (drafts waiting for a reviewer, oldest first, with how long each has waited).
#include <optional>
#include <string>
#include <vector>

#include "report/certificates/list.hpp"
#include "store/database.hpp"

namespace plumb::app {

/// Filters as typed; absent means no filter. Dates are ISO 8601 and bound the UTC date of issue, inclusive.
struct CertificateFilter {
  std::optional<std::string> state;  ///< draft, approved, superseded, withdrawn
  std::optional<std::string> instrument;
  std::optional<std::string> from, to;
};

struct CertificateList {
  std::vector<report::CertificateListItem> items;  ///< oldest issued first
  std::string scope;                               ///< the filters in words, e.g. "state draft, instrument BAL-A"
};

/// The certificates that match every filter. InputError naming the option for an unknown state or
/// instrument, a date that is not one, or --from after --to.
CertificateList list_certificates(store::Database& db, const CertificateFilter& filter);

struct ApprovalQueue {
  Date on;
  std::vector<report::CertificateListItem> items;  ///< drafts issued on or before `on`, oldest first
};

/// The drafts waiting for approval on `on` (default today, UTC), optionally of one instrument.
ApprovalQueue approval_queue(store::Database& db, const std::optional<std::string>& instrument,
                             const std::optional<std::string>& on);

}  // namespace plumb::app
