#include "app/certificates/history_section.hpp"

#include <algorithm>

#include "app/history/instrument_history.hpp"
#include "store/repository.hpp"

namespace plumb::app {

nlohmann::json certificate_history(store::Database& db, const store::RunRecord& run) {
  if (!store::instrument_exists(db.sql(), run.instrument_id)) return nullptr;
  const InstrumentInfo inst = find_instrument(db, run.instrument_id);
  // The first quantity of the instrument's kind read from runs of this procedure (bias for a weekly check, the
  // error at the largest load for a calibration, e_s % for a pipette).
  const auto& table = history_quantities();
  const auto found = std::find_if(table.begin(), table.end(), [&](const HistoryQuantity& h) {
    return h.instrument_kind == inst.kind && h.procedure == run.procedure;
  });
  if (found == table.end()) return nullptr;
  const HistoryQuantity& q = *found;
  const report::SeriesView s = series_view(db, inst, q, {std::nullopt, run.performed_on});
  nlohmann::json points = nlohmann::json::array();
  const std::size_t first = s.points.size() > certificate_history_points ? s.points.size() - certificate_history_points : 0;
  for (std::size_t i = first; i < s.points.size(); ++i)
    points.push_back({{"run_id", s.run_ids[i]},
                      {"date", to_string(s.points[i].date)},
                      {"value", s.points[i].value},
                      {"u", s.points[i].expanded_uncertainty}});
  const auto& t = s.quantity.tolerance;
  return {{"quantity", q.key},
          {"label", s.quantity.label},
          {"unit", s.quantity.unit},
          {"lower", t.lower ? nlohmann::json(*t.lower) : nlohmann::json()},
          {"upper", t.upper ? nlohmann::json(*t.upper) : nlohmann::json()},
          {"tolerance_basis", s.quantity.tolerance_basis},
          {"uncertainty_basis", s.quantity.uncertainty_basis},
          {"points", points}};
}

}  // namespace plumb::app
