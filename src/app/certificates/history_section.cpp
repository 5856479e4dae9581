#include "app/certificates/history_section.hpp"

#include <algorithm>

#include "app/history/instrument_history.hpp"
#include "app/history/trends.hpp"
#include "store/repository.hpp"

namespace plumb::app {

nlohmann::json certificate_history(store::Database& db, const store::RunRecord& run) {
  if (!store::instrument_exists(db.sql(), run.instrument_id)) return nullptr;
  const InstrumentInfo inst = find_instrument(db, run.instrument_id);
  // The first quantity of the instrument's kind read from runs of this procedure (bias for a weekly check, the
  // error at the largest load for a calibration, e_s % for a pipette); on a failed check, the quantity of the
  // first criterion that failed (a check failed on its SD charts the SD, not the bias).
  const auto& table = history_quantities();
  const auto of_run = [&](const HistoryQuantity& h) {
    return h.instrument_kind == inst.kind && h.procedure == run.procedure;
  };
  auto found = std::find_if(table.begin(), table.end(), of_run);
  if (run.verdict == Verdict::fail && run.results.is_object())
    for (const auto& c : run.results.value("criteria", nlohmann::json::array())) {
      if (c.value("pass", true)) continue;
      const std::string failed = c.value("quantity", "");
      const auto charted = std::find_if(table.begin(), table.end(), [&](const HistoryQuantity& h) {
        return of_run(h) && !h.criterion.empty() && h.criterion == failed;
      });
      if (charted != table.end()) found = charted;
      break;
    }
  if (found == table.end()) return nullptr;
  const HistoryQuantity& q = *found;
  const report::SeriesView s = series_view(db, inst, q, {std::nullopt, run.performed_on});
  nlohmann::json points = nlohmann::json::array();
  const std::size_t first =
      s.points.size() > certificate_history_points ? s.points.size() - certificate_history_points : 0;
  const report::HistoryChartMarks marks = chart_marks(s, history_view(db, inst, {std::nullopt, run.performed_on}));
  for (std::size_t i = first; i < s.points.size(); ++i) {
    nlohmann::json p = {{"run_id", s.run_ids[i]},
                        {"date", to_string(s.points[i].date)},
                        {"value", s.points[i].value},
                        {"u", s.points[i].expanded_uncertainty}};
    if (i < marks.outcomes.size() && marks.outcomes[i] == report::ChartPoint::Outcome::failed) p["failed"] = true;
    points.push_back(std::move(p));
  }
  const auto& t = s.quantity.tolerance;
  return {{"quantity", q.key},
          {"label", s.quantity.label},
          {"unit", s.quantity.unit},
          {"lower", t.lower ? nlohmann::json(*t.lower) : nlohmann::json()},
          {"upper", t.upper ? nlohmann::json(*t.upper) : nlohmann::json()},
          {"tolerance_basis", s.quantity.tolerance_basis},
          {"uncertainty_basis", s.quantity.uncertainty_basis},
          {"non_negative", s.quantity.non_negative},
          {"points", points}};
}

}  // namespace plumb::app
