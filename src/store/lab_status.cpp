#include "store/lab_status.hpp"

#include <SQLiteCpp/Statement.h>

#include "store/columns.hpp"

namespace plumb::store {
namespace {

// For each instrument, the index check_runs_by_instrument (instrument_id, performed_on, id) is walked
// backwards to its first run that nothing supersedes and that is not void (index check_runs_superseded,
// run_voids' key): a handful of index
// steps per instrument instead of a scan of every run.
constexpr const char* status_select = R"(
SELECT i.id, i.kind, i.location, i.check_every, i.created_on,
       r.id, r.procedure, r.performed_on, r.operator, r.verdict, r.next_due,
       json_extract(r.results_json, '$.bias_g'), json_extract(r.results_json, '$.sd_g'), b.readability_g,
       (SELECT json_extract(c.value, '$.systematic_error_pct')
          FROM json_each(r.results_json, '$.volumes') v, json_each(v.value, '$.channels') c
          ORDER BY abs(json_extract(c.value, '$.systematic_error_pct')) DESC LIMIT 1),
       (SELECT max(json_extract(c.value, '$.cv_pct'))
          FROM json_each(r.results_json, '$.volumes') v, json_each(v.value, '$.channels') c)
FROM instruments i
LEFT JOIN balances b ON b.instrument_id = i.id
LEFT JOIN check_runs r ON r.id = (
  SELECT l.id FROM check_runs l
  WHERE l.instrument_id = i.id
    AND NOT EXISTS (SELECT 1 FROM check_runs s WHERE s.supersedes = l.id)
    AND NOT EXISTS (SELECT 1 FROM run_voids v WHERE v.run_id = l.id)
  ORDER BY l.performed_on DESC, l.id DESC LIMIT 1)
)";
constexpr const char* every_instrument = "WHERE ?1 = '' OR i.kind = ?1 ORDER BY i.id COLLATE natural_id";
constexpr const char* one_instrument = "WHERE i.id = ?2 AND (?1 = '' OR i.kind = ?1)";

Date date_column(const SQLite::Column& c) { return parse_date(c.getString(), "stored date"); }

std::optional<double> number_column(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return c.getDouble();
}

}  // namespace

void for_each_instrument_status(SQLite::Database& db, const std::string& kind,
                                const std::function<void(const InstrumentStatus&)>& visit, const std::string& only_id) {
  SQLite::Statement q(db, std::string(status_select) + (only_id.empty() ? every_instrument : one_instrument));
  q.bind(1, kind);
  if (!only_id.empty()) q.bind(2, only_id);
  InstrumentStatus s;
  while (q.executeStep()) {
    s.id = q.getColumn(0).getString();
    s.kind = q.getColumn(1).getString();
    s.location = q.getColumn(2).getString();
    s.check_every = q.getColumn(3).getString();
    s.created_on = date_column(q.getColumn(4));
    s.readability_g.reset();
    if (!q.getColumn(13).isNull()) s.readability_g = q.getColumn(13).getString();
    s.latest.reset();
    if (!q.getColumn(5).isNull()) {
      LatestResult r;
      r.run_id = q.getColumn(5).getInt64();
      r.procedure = stored_procedure(q.getColumn(6));
      r.performed_on = date_column(q.getColumn(7));
      r.operator_name = q.getColumn(8).getString();
      r.verdict = q.getColumn(9).getString() == "pass" ? Verdict::pass : Verdict::fail;
      if (!q.getColumn(10).isNull()) r.next_due = date_column(q.getColumn(10));
      r.bias_g = number_column(q.getColumn(11));
      r.sd_g = number_column(q.getColumn(12));
      r.systematic_error_pct = number_column(q.getColumn(14));
      r.cv_pct = number_column(q.getColumn(15));
      s.latest = std::move(r);
    }
    visit(s);
  }
}

}  // namespace plumb::store
