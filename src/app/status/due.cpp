#include "app/status/due.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "store/calibration.hpp"
#include "store/lab_status.hpp"
#include "store/repository.hpp"
#include "store/status_events.hpp"

namespace plumb::app {
namespace {

std::string timing_status(int days_left, int within_days) {
  if (days_left < 0) return "overdue";
  if (days_left <= within_days) return "due";
  return "in date";
}

/// What the due list needs of a run, whichever query found it.
struct RunSummary {
  std::int64_t id = 0;
  Date performed_on;
  Verdict verdict = Verdict::pass;
  std::optional<Date> next_due;
};

std::optional<RunSummary> summary_of(const std::optional<store::LatestResult>& r) {
  if (!r) return std::nullopt;
  return RunSummary{r->run_id, r->performed_on, r->verdict, r->next_due};
}

std::optional<RunSummary> summary_of(const std::optional<store::RunRecord>& r) {
  if (!r) return std::nullopt;
  return RunSummary{r->id, r->performed_on, r->verdict, r->next_due};
}

/// The weekly-check line of an instrument from its latest check (and, for a calibrated balance, its
/// latest calibration: a passing calibration counts as a passing check of its day, a failed one takes
/// the balance out of service; see app/calibration/record.hpp).
report::DueItem check_item(const std::string& kind, const store::InstrumentStatus& s, const std::optional<RunSummary>& last,
                   const std::optional<RunSummary>& cal, Date on, int within_days) {
  report::DueItem item{kind, s.id, s.location, "", std::nullopt, std::nullopt, ""};
  const bool cal_failed = cal && cal->verdict == Verdict::fail;
  const bool cal_counts = cal && cal->verdict == Verdict::pass && (!last || cal->performed_on >= last->performed_on);
  if (cal_failed) {
    item.status = "out of service";
    item.detail = fmt::format("failed calibration run {} on {}", cal->id, to_string(cal->performed_on));
  } else if (last && last->verdict == Verdict::fail && !cal_counts) {
    item.status = "out of service";
    item.detail = fmt::format("failed check run {} on {}", last->id, to_string(last->performed_on));
  } else {
    if (cal_counts) {
      item.due_on = add_interval(cal->performed_on, Interval::parse(s.check_every));
      item.detail = fmt::format("last passed calibration {} (run {})", to_string(cal->performed_on), cal->id);
    } else {
      item.due_on = last && last->next_due ? *last->next_due : s.created_on;
      item.detail = last ? fmt::format("last passed {} (run {})", to_string(last->performed_on), last->id)
                         : "no check recorded yet";
    }
    item.days_left = days_between(on, *item.due_on);
    item.status = timing_status(*item.days_left, within_days);
  }
  return item;
}

report::DueItem calibration_item(const store::InstrumentStatus& s, const std::optional<store::CalibrationSettings>& settings,
                         const std::optional<RunSummary>& cal, Date on, int within_days) {
  report::DueItem c{"calibration", s.id, s.location, "", std::nullopt, std::nullopt, ""};
  if (cal && cal->verdict == Verdict::fail) {
    c.status = "out of service";
    c.detail = fmt::format("failed calibration run {} on {}", cal->id, to_string(cal->performed_on));
    return c;
  }
  c.due_on = cal && cal->next_due ? *cal->next_due : settings->effective_on;
  c.days_left = days_between(on, *c.due_on);
  c.status = timing_status(*c.days_left, within_days);
  c.detail = cal ? fmt::format("last calibrated {} (run {})", to_string(cal->performed_on), cal->id)
                 : "not calibrated yet";
  return c;
}

}  // namespace

std::vector<report::DueItem> due_lines_in_id_order(store::Database& db, Date on, int within_days,
                                                   const std::string& only_id) {
  std::vector<report::DueItem> items;
  // One set-based query gives every instrument's latest run, so a large lab is not one query per
  // instrument; only balances with calibration settings need their calibration looked up apart.
  const auto all_settings = store::all_current_calibration_settings(db.sql());
  store::for_each_instrument_status(
      db.sql(), "",
      [&](const store::InstrumentStatus& s) {
        if (s.kind != "balance") {
          items.push_back(check_item(s.kind, s, summary_of(s.latest), std::nullopt, on, within_days));
          return;
        }
        const auto found = all_settings.find(s.id);
        const std::optional<store::CalibrationSettings> settings =
            found == all_settings.end() ? std::nullopt : std::optional(found->second);
        if (!settings) {
          items.push_back(check_item("balance", s, summary_of(s.latest), std::nullopt, on, within_days));
          return;
        }
        const auto last =
            summary_of(store::latest_run_by_procedure(db.sql(), s.id, checks::Procedure::calibration, false));
        const auto cal =
            summary_of(store::latest_run_by_procedure(db.sql(), s.id, checks::Procedure::calibration, true));
        items.push_back(check_item("balance", s, last, cal, on, within_days));
        items.push_back(calibration_item(s, settings, cal, on, within_days));
      },
      only_id);
  for (const auto& w : only_id.empty() ? store::list_weights(db.sql()) : std::vector<store::WeightRecord>{}) {
    report::DueItem item{"weight", w.id, "", "", w.current.due_on, days_between(on, w.current.due_on),
                 fmt::format("certificate {} ({} class {})", w.current.certificate_no, w.nominal_text, w.weight_class)};
    item.status = timing_status(*item.days_left, within_days);
    items.push_back(std::move(item));
  }
  // Retired instruments and weights are kept in history but are not due for anything: they are listed as
  // retired (with --all), with no due date.
  const auto retired_instruments = store::retired_ids(db.sql(), "instrument");
  const auto retired_weights = store::retired_ids(db.sql(), "weight");
  for (auto& i : items) {
    const bool weight = i.kind == "weight";
    if (!(weight ? retired_weights.count(i.id) : retired_instruments.count(i.id))) continue;
    const auto r = store::retirement(db.sql(), weight ? "weight" : "instrument", i.id);
    i.status = "retired";
    i.due_on.reset();
    i.days_left.reset();
    i.detail = r ? fmt::format("retired {}: {}", r->recorded_at.substr(0, 10), r->reason) : "retired";
  }
  return items;
}

void order_due_items(std::vector<report::DueItem>& items, bool everything) {
  if (!everything)
    std::erase_if(items, [](const report::DueItem& i) { return i.status == "in date" || i.status == "retired"; });
  std::stable_sort(items.begin(), items.end(), [](const report::DueItem& a, const report::DueItem& b) {
    const bool a_out = a.status == "out of service", b_out = b.status == "out of service";
    if (a_out != b_out) return a_out;
    const bool a_retired = a.status == "retired", b_retired = b.status == "retired";
    if (a_retired != b_retired) return b_retired;  // retired items last: nothing is due for them
    return a.days_left.value_or(0) < b.days_left.value_or(0);
  });
}

std::vector<report::DueItem> due_items(store::Database& db, Date on, int within_days, bool everything) {
  auto items = due_lines_in_id_order(db, on, within_days, "");
  order_due_items(items, everything);
  return items;
}

std::vector<report::DueItem> instrument_due_items(store::Database& db, const std::string& instrument_id, Date on,
                                                  int within_days, bool everything) {
  auto items = due_lines_in_id_order(db, on, within_days, instrument_id);
  order_due_items(items, everything);
  return items;
}

int standing_rank(std::string_view status) {
  for (std::size_t i = 0; i < standings.size(); ++i)
    if (standings[i] == status) return static_cast<int>(i);
  throw std::logic_error(fmt::format("\"{}\" is not a standing", status));
}

std::map<std::string, report::DueItem> standings_on(store::Database& db, Date on, int within_days) {
  std::map<std::string, report::DueItem> out;
  for (auto& item : due_items(db, on, within_days, true)) {
    const std::string key = standing_key(item.kind == "weight" ? "weight" : "instrument", item.id);
    const auto it = out.find(key);
    if (it == out.end()) out.emplace(key, std::move(item));
    else if (standing_rank(item.status) < standing_rank(it->second.status)) it->second = std::move(item);
  }
  return out;
}

std::map<std::string, std::string> instrument_standings(store::Database& db, Date on) {
  std::map<std::string, std::string> out;
  const std::string prefix = standing_key("instrument", "");
  for (const auto& [key, item] : standings_on(db, on, default_due_window_days))
    if (key.rfind(prefix, 0) == 0) out[key.substr(prefix.size())] = item.status;
  return out;
}

}  // namespace plumb::app
