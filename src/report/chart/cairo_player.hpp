#pragma once
// The cairo half of the drawing back end (built into the drawing module, never into the plumb binary itself):
// plays a Drawing on a cairo context, and measures text with pango for layout.
#include <cairo.h>

#include <memory>

#include "report/chart/drawing.hpp"

namespace plumb::report {

/// Draws every operation of `d` in order, its top-left corner at the current origin.
void play_drawing(cairo_t* cr, const Drawing& d);

/// The font's metrics through pango at 72 dpi, unhinted, so that a width is the same in SVG, PDF and PNG. The
/// advance of each character is read once per style and kept (a line's width is the sum: kerning, a fraction
/// of a point, is left out). Safe to call from several threads.
std::unique_ptr<TextMeasure> make_pango_measure();

}  // namespace plumb::report
