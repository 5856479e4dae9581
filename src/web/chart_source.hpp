#pragma once
// The one place the web application asks for a chart (so that the charts' renderer can change under it): an
// instrument's history of one quantity, drawn by the same report/history functions as `plumb history --chart`.
#include <string>
#include <vector>

#include "store/database.hpp"

namespace plumb::web {

struct InstrumentChart {
  std::string quantity;  ///< "bias", "sd", ...
  std::string svg;       ///< as history_chart_svg draws it
};

/// The history chart of every quantity of an instrument that has a result to draw, in the quantities' order.
std::vector<InstrumentChart> instrument_charts(store::Database& db, const std::string& instrument_id);

/// The history chart of `quantity` as an SVG element whose text is real <text> (report::chart_svg: every text
/// escaped, no ids, no style attributes), inline in a page or served alone; InputError for an unknown instrument or
/// quantity, or no result.
std::string history_chart_svg(store::Database& db, const std::string& instrument_id, const std::string& quantity);

}  // namespace plumb::web
