#pragma once
// The lab at a glance (the web overview): how many instruments are overdue, due, out of service and retired, the
// reference weights due, the drafts awaiting approval, and the due lines that need attention. Kept between
// requests under the trail's last record (store::trail_tail): a request after no change costs a look-up; after a
// few weekly checks only the instruments they concern are read again; after anything else, the whole lab.
#include <cstddef>
#include <map>
#include <memory>
#include <string>
#include <vector>

#include "core/dates.hpp"
#include "report/status/views.hpp"
#include "store/database.hpp"

namespace plumb::app {

struct LabOverview {
  Date on;
  int within_days = 0;
  std::size_t overdue = 0, due = 0, out_of_service = 0, retired = 0;  ///< instruments' due lines
  std::size_t weights_due = 0;                                        ///< overdue or due
  std::size_t drafts = 0;  ///< certificates awaiting approval (app::approval_queue as of today, UTC)
  /// Every line that is not in date and not retired, in the order of `plumb due` (out of service first, then by
  /// days left).
  std::vector<report::DueItem> attention;
  /// Every item's one standing, as app::standings_on gives it (key app::standing_key(kind, id)).
  std::map<std::string, report::DueItem> standings;
};

/// The overview of the lab in `db` on `on`, "due" meaning within `within_days`. The same counts and lines as
/// app::due_items(db, on, within_days, true) and app::approval_queue give at this moment, whatever another
/// process wrote since the last call. Safe to call from several threads.
std::shared_ptr<const LabOverview> lab_overview(store::Database& db, Date on, int within_days);

}  // namespace plumb::app
