#include "app/status/summary.hpp"

#include "app/status/due.hpp"

namespace plumb::app {

void lab_summary(store::Database& db, Date on, const std::function<void(const report::SummaryRow&)>& visit) {
  // The same standing as the due list (retired, a failed calibration, never checked ...), so that no two outputs
  // disagree about an instrument.
  const auto standing_of = standings_on(db, on, default_due_window_days);
  report::SummaryRow row;
  store::for_each_instrument_status(db.sql(), "", [&](const store::InstrumentStatus& s) {
    row.instrument = s;
    const auto it = standing_of.find(standing_key("instrument", s.id));
    row.status = it == standing_of.end() ? "in date" : it->second.status;
    row.next_due = it == standing_of.end() ? std::nullopt : it->second.due_on;
    row.days_left = it == standing_of.end() ? std::nullopt : it->second.days_left;
    visit(row);
  });
}

}  // namespace plumb::app
