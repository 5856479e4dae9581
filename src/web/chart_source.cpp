#include "web/chart_source.hpp"

#include <fmt/format.h>

#include "app/history/instrument_history.hpp"
#include "app/history/trends.hpp"
#include "core/errors.hpp"
#include "report/chart/chart.hpp"

namespace plumb::web {

std::vector<InstrumentChart> instrument_charts(store::Database& db, const std::string& instrument_id) {
  const auto instrument = app::find_instrument(db, instrument_id);
  // The history is read once for every chart of the page.
  const auto history = app::read_run_history(db, instrument);
  std::vector<InstrumentChart> out;
  for (const auto& key : app::quantity_keys(instrument.kind)) {
    const auto q = app::find_quantity(key, instrument);
    const auto series = app::series_view(history, q, {});
    if (series.points.empty()) continue;
    const auto all = app::history_view(history, {}, {&q});
    out.push_back({key, report::chart_svg(app::history_chart(series, all))});
  }
  return out;
}

std::string history_chart_svg(store::Database& db, const std::string& instrument_id, const std::string& quantity) {
  const auto instrument = app::find_instrument(db, instrument_id);
  const auto q = app::find_quantity(quantity, instrument);
  const auto history = app::read_run_history(db, instrument);
  const auto series = app::series_view(history, q, {});
  if (series.points.empty())
    throw InputError(fmt::format("instrument {} has no result of {} to draw.", instrument_id, quantity));
  const auto all = app::history_view(history, {}, {&q});
  return report::chart_svg(app::history_chart(series, all));
}

}  // namespace plumb::web
