#include "app/due_list.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "store/lab_status.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

std::string timing_status(int days_left, int within_days) {
  if (days_left < 0) return "overdue";
  if (days_left <= within_days) return "due";
  return "in date";
}

}  // namespace

std::vector<DueItem> due_items(store::Database& db, Date on, int within_days, bool everything) {
  std::vector<DueItem> items;
  // One set-based query for every balance's latest run (not one query per balance): fast on a large lab.
  store::for_each_instrument_status(db.sql(), "balance", [&](const store::InstrumentStatus& b) {
    DueItem item{"balance", b.id, b.location, "", std::nullopt, std::nullopt, ""};
    const auto& last = b.latest;
    if (last && last->verdict == Verdict::fail) {
      item.status = "out of service";
      item.detail = fmt::format("failed check run {} on {}", last->run_id, to_string(last->performed_on));
    } else {
      item.due_on = last && last->next_due ? *last->next_due : b.created_on;
      item.days_left = days_between(on, *item.due_on);
      item.status = timing_status(*item.days_left, within_days);
      item.detail = last ? fmt::format("last passed {} (run {})", to_string(last->performed_on), last->run_id)
                         : "no check recorded yet";
    }
    items.push_back(std::move(item));
  });
  for (const auto& w : store::list_weights(db.sql())) {
    DueItem item{"weight", w.id, "", "", w.current.due_on, days_between(on, w.current.due_on),
                 fmt::format("certificate {} ({} class {})", w.current.certificate_no, w.nominal_text, w.weight_class)};
    item.status = timing_status(*item.days_left, within_days);
    items.push_back(std::move(item));
  }
  if (!everything)
    std::erase_if(items, [](const DueItem& i) { return i.status == "in date"; });
  std::stable_sort(items.begin(), items.end(), [](const DueItem& a, const DueItem& b) {
    const bool a_out = a.status == "out of service", b_out = b.status == "out of service";
    if (a_out != b_out) return a_out;
    return a.days_left.value_or(0) < b.days_left.value_or(0);
  });
  return items;
}

}  // namespace plumb::app
