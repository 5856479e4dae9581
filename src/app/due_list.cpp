#include "app/due_list.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "store/calibration.hpp"
#include "store/pipettes.hpp"
#include "store/repository.hpp"
#include "store/status_events.hpp"

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
  for (const auto& b : store::list_balances(db.sql())) {
    DueItem item{"balance", b.id, b.location, "", std::nullopt, std::nullopt, ""};
    // Weekly checks and calibrations keep separate schedules (see app/record_calibration.hpp for the rules).
    const auto last = store::latest_run_by_procedure(db.sql(), b.id, "calibration", false);
    const auto cal = store::latest_run_by_procedure(db.sql(), b.id, "calibration", true);
    const bool cal_failed = cal && cal->verdict == Verdict::fail;
    // A passing calibration counts as a passing check of the day it was done (it covers more).
    const bool cal_counts = cal && cal->verdict == Verdict::pass && (!last || cal->performed_on >= last->performed_on);
    if (cal_failed) {
      item.status = "out of service";
      item.detail = fmt::format("failed calibration run {} on {}", cal->id, to_string(cal->performed_on));
    } else if (last && last->verdict == Verdict::fail && !cal_counts) {
      item.status = "out of service";
      item.detail = fmt::format("failed check run {} on {}", last->id, to_string(last->performed_on));
    } else {
      if (cal_counts) {
        item.due_on = add_interval(cal->performed_on, b.every);
        item.detail = fmt::format("last passed calibration {} (run {})", to_string(cal->performed_on), cal->id);
      } else {
        item.due_on = last && last->next_due ? *last->next_due : b.created_on;
        item.detail = last ? fmt::format("last passed {} (run {})", to_string(last->performed_on), last->id)
                           : "no check recorded yet";
      }
      item.days_left = days_between(on, *item.due_on);
      item.status = timing_status(*item.days_left, within_days);
    }
    items.push_back(std::move(item));
    const auto settings = store::find_calibration_settings(db.sql(), b.id);
    if (!settings && !cal) continue;
    DueItem c{"calibration", b.id, b.location, "", std::nullopt, std::nullopt, ""};
    if (cal_failed) {
      c.status = "out of service";
      c.detail = fmt::format("failed calibration run {} on {}", cal->id, to_string(cal->performed_on));
    } else {
      c.due_on = cal && cal->next_due ? *cal->next_due : settings->effective_on;
      c.days_left = days_between(on, *c.due_on);
      c.status = timing_status(*c.days_left, within_days);
      c.detail = cal ? fmt::format("last calibrated {} (run {})", to_string(cal->performed_on), cal->id)
                     : "not calibrated yet";
    }
    items.push_back(std::move(c));
  }
  // Pipettes: due on the next due date of their latest passing check; out of service after a failed one.
  for (const auto& p : store::list_pipettes(db.sql())) {
    DueItem item{"pipette", p.id(), p.location, "", std::nullopt, std::nullopt, ""};
    const auto last = store::latest_run(db.sql(), p.id());
    if (last && last->verdict == Verdict::fail) {
      item.status = "out of service";
      item.detail = fmt::format("failed check run {} on {}", last->id, to_string(last->performed_on));
    } else {
      item.due_on = last && last->next_due ? *last->next_due : p.created_on;
      item.days_left = days_between(on, *item.due_on);
      item.status = timing_status(*item.days_left, within_days);
      item.detail = last ? fmt::format("last passed {} (run {})", to_string(last->performed_on), last->id)
                         : "no check recorded yet";
    }
    items.push_back(std::move(item));
  }
  for (const auto& w : store::list_weights(db.sql())) {
    DueItem item{"weight", w.id, "", "", w.current.due_on, days_between(on, w.current.due_on),
                 fmt::format("certificate {} ({} class {})", w.current.certificate_no, w.nominal_text, w.weight_class)};
    item.status = timing_status(*item.days_left, within_days);
    items.push_back(std::move(item));
  }
  // Retired instruments and weights are kept in history but are not due for anything.
  const auto retired_instruments = store::retired_ids(db.sql(), "instrument");
  const auto retired_weights = store::retired_ids(db.sql(), "weight");
  std::erase_if(items, [&](const DueItem& i) {
    return i.kind == "weight" ? retired_weights.count(i.id) > 0 : retired_instruments.count(i.id) > 0;
  });
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
