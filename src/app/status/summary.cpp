#include "app/status/summary.hpp"

namespace plumb::app {

void lab_summary(store::Database& db, Date on, const std::function<void(const report::SummaryRow&)>& visit) {
  report::SummaryRow row;
  store::for_each_instrument_status(db.sql(), "", [&](const store::InstrumentStatus& s) {
    row.instrument = s;
    row.next_due.reset();
    row.days_left.reset();
    if (s.latest && s.latest->verdict == Verdict::fail) {
      row.status = "out of service";
    } else {
      // As in the due list: never checked means due from the day it was registered.
      row.next_due = s.latest && s.latest->next_due ? *s.latest->next_due : s.created_on;
      row.days_left = days_between(on, *row.next_due);
      row.status = *row.days_left < 0 ? "overdue" : "in date";
    }
    visit(row);
  });
}

}  // namespace plumb::app
