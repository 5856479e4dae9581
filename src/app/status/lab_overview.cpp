#include "app/status/lab_overview.hpp"

#include <algorithm>
#include <map>
#include <mutex>
#include <set>
#include <string>

#include "app/certificates/list.hpp"
#include "app/status/due.hpp"
#include "store/audit_trail.hpp"
#include "store/item_trail.hpp"

namespace plumb::app {
namespace {

/// What one database's overview was computed from, and the lines it keeps to be updated in place.
struct KeptOverview {
  std::int64_t seq = 0;  ///< the trail's last record then, and its hash
  std::string hash;
  Date on;
  Date utc_on;
  int within_days = 0;
  std::vector<report::DueItem> lines;  ///< app::due_lines_in_id_order: an instrument's lines together
  std::shared_ptr<const LabOverview> overview;
};

std::mutex kept_mutex;
std::map<std::string, KeptOverview> kept_overviews;  // by database path

std::shared_ptr<const LabOverview> summarise(const std::vector<report::DueItem>& lines, Date on, int within_days,
                                             std::size_t drafts) {
  auto ordered = lines;
  order_due_items(ordered, true);
  auto out = std::make_shared<LabOverview>();
  out->on = on;
  out->within_days = within_days;
  out->drafts = drafts;
  // The line that matters most of each item, the first of equals (app::standings_on).
  for (const auto& item : ordered) {
    const std::string key = standing_key(item.kind == "weight" ? "weight" : "instrument", item.id);
    const auto it = out->standings.find(key);
    if (it == out->standings.end())
      out->standings.emplace(key, item);
    else if (standing_rank(item.status) < standing_rank(it->second.status))
      it->second = item;
  }
  for (auto& item : ordered) {
    const bool weight = item.kind == "weight";
    if (weight && (item.status == "overdue" || item.status == "due")) ++out->weights_due;
    if (!weight && item.status == "overdue") ++out->overdue;
    if (!weight && item.status == "due") ++out->due;
    if (!weight && item.status == "out of service") ++out->out_of_service;
    if (!weight && item.status == "retired") ++out->retired;
    if (item.status == "in date" || item.status == "retired") continue;
    out->attention.push_back(std::move(item));
  }
  return out;
}

std::size_t draft_count(store::Database& db, Date utc_on) {
  return approval_queue(db, std::nullopt, to_string(utc_on)).items.size();
}

/// What the records after the kept seq change: the instruments whose runs they record, whether the drafts may have
/// changed; false when some record is of another kind (an instrument registered, a weight, a retirement ...),
/// which the whole lab is read again for.
bool changes_since(store::Database& db, std::int64_t seq, std::set<std::string>& instruments, bool& drafts) {
  for (const auto& r : store::record_names_since(db.sql(), seq)) {
    if (r.table == "check_runs" && r.key.starts_with("id=")) {
      const auto instrument = store::run_instrument(db.sql(), std::stoll(r.key.substr(3)));
      if (!instrument) return false;
      instruments.insert(*instrument);
    } else if (r.table == "certificates" || r.table == "certificate_events" || r.table == "signatures") {
      drafts = true;
    } else {
      return false;
    }
  }
  return true;
}

/// Replaces one instrument's lines in id order by its lines now (they stay together, at the same place).
void replace_lines(store::Database& db, KeptOverview& k, const std::string& instrument) {
  auto fresh = due_lines_in_id_order(db, k.on, k.within_days, instrument);
  const auto first = std::find_if(k.lines.begin(), k.lines.end(),
                                  [&](const report::DueItem& i) { return i.kind != "weight" && i.id == instrument; });
  const auto last = std::find_if(first, k.lines.end(),
                                 [&](const report::DueItem& i) { return i.kind == "weight" || i.id != instrument; });
  const auto at = k.lines.erase(first, last);
  k.lines.insert(at, std::make_move_iterator(fresh.begin()), std::make_move_iterator(fresh.end()));
}

}  // namespace

std::shared_ptr<const LabOverview> lab_overview(store::Database& db, Date on, int within_days) {
  // One computation at a time: requests arriving meanwhile wait for it and then find it kept.
  const std::lock_guard<std::mutex> lock(kept_mutex);
  // The tail is read before the lines: what is kept is never older than the tail it is kept under.
  const auto [seq, hash] = store::trail_tail(db.sql());
  const Date utc_on = today_utc();
  auto& k = kept_overviews[db.path().string()];
  const bool same_view = k.overview && k.on == on && k.utc_on == utc_on && k.within_days == within_days;
  if (same_view && k.seq == seq && k.hash == hash) return k.overview;
  std::set<std::string> instruments;
  bool drafts = false;
  // An update in place needs the kept record still there unchanged (a restored backup is another trail).
  const bool in_place = same_view && seq > k.seq && store::record_hash(db.sql(), k.seq) == k.hash &&
                        changes_since(db, k.seq, instruments, drafts);
  if (in_place) {
    for (const auto& id : instruments) replace_lines(db, k, id);
    k.overview = summarise(k.lines, on, within_days, drafts ? draft_count(db, utc_on) : k.overview->drafts);
  } else {
    k.lines = due_lines_in_id_order(db, on, within_days);
    k.overview = summarise(k.lines, on, within_days, draft_count(db, utc_on));
  }
  k.seq = seq;
  k.hash = hash;
  k.on = on;
  k.utc_on = utc_on;
  k.within_days = within_days;
  return k.overview;
}

}  // namespace plumb::app
