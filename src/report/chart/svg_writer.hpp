#pragma once
// A Drawing written as SVG 1.1 with real text: <text> in the font's family, size and weight (selectable and
// searchable in a browser), <path>, <circle> and <rect> for the shapes. Consecutive shapes of one style share
// a <g> that carries the style, so a chart of hundreds of points stays small. The plot's clip is a nested
// <svg> (which clips to its box), so the file defines no ids and several charts can sit inline in one page.
// Every text and attribute value is escaped.
#include <string>
#include <string_view>

#include "report/chart/draw_record.hpp"
#include "report/chart/drawing.hpp"

namespace plumb::report {

/// Appends the SVG document to `out`: the <svg> element with <title>, <desc>, the <metadata> record of what
/// was drawn (draw_record.hpp) and the drawing. No XML declaration, so the same text serves a file and an
/// HTML page (UTF-8 either way).
void append_svg(std::string& out, const Drawing& drawing, std::string_view title, std::string_view description,
                const DrawRecord& record);

}  // namespace plumb::report
