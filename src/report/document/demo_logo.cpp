#include "report/chart/cairo_backend.hpp"

#include <cairo.h>
#include <fmt/format.h>

#include <numbers>

#include "core/errors.hpp"

namespace plumb::report {

void write_demo_logo_with_cairo(const std::filesystem::path& path) {
  constexpr int size = 240;
  cairo_surface_t* surface = cairo_image_surface_create(CAIRO_FORMAT_ARGB32, size, size);
  cairo_t* cr = cairo_create(surface);
  const double pi = std::numbers::pi;
  // A rounded teal tile with a white two-pan beam over a wave: a harbourside weighing room, invented.
  const double r = 36;
  cairo_new_sub_path(cr);
  cairo_arc(cr, size - r, r, r, -pi / 2, 0);
  cairo_arc(cr, size - r, size - r, r, 0, pi / 2);
  cairo_arc(cr, r, size - r, r, pi / 2, pi);
  cairo_arc(cr, r, r, r, pi, 3 * pi / 2);
  cairo_close_path(cr);
  cairo_set_source_rgb(cr, 0.05, 0.36, 0.42);
  cairo_fill(cr);

  cairo_set_source_rgb(cr, 1, 1, 1);
  cairo_set_line_width(cr, 9);
  cairo_set_line_cap(cr, CAIRO_LINE_CAP_ROUND);
  cairo_move_to(cr, 120, 52);  // column
  cairo_line_to(cr, 120, 150);
  cairo_move_to(cr, 50, 70);  // beam
  cairo_line_to(cr, 190, 70);
  cairo_stroke(cr);
  cairo_set_line_width(cr, 4);
  for (double x : {62.0, 178.0}) {  // hangers and pans
    cairo_move_to(cr, x, 70);
    cairo_line_to(cr, x - 24, 118);
    cairo_move_to(cr, x, 70);
    cairo_line_to(cr, x + 24, 118);
    cairo_stroke(cr);
    cairo_arc(cr, x, 118, 26, 0, pi);
    cairo_fill(cr);
  }
  cairo_arc(cr, 120, 48, 10, 0, 2 * pi);
  cairo_fill(cr);
  cairo_move_to(cr, 88, 160);  // base
  cairo_line_to(cr, 152, 160);
  cairo_line_to(cr, 140, 150);
  cairo_line_to(cr, 100, 150);
  cairo_close_path(cr);
  cairo_fill(cr);
  cairo_set_line_width(cr, 7);  // the wave
  cairo_move_to(cr, 36, 196);
  cairo_curve_to(cr, 66, 176, 90, 216, 120, 196);
  cairo_curve_to(cr, 150, 176, 174, 216, 204, 196);
  cairo_stroke(cr);

  cairo_destroy(cr);
  const cairo_status_t st = cairo_surface_write_to_png(surface, path.c_str());
  cairo_surface_destroy(surface);
  if (st != CAIRO_STATUS_SUCCESS)
    throw StorageError(fmt::format("cannot write the logo file \"{}\": {}.", path.string(), cairo_status_to_string(st)));
}

}  // namespace plumb::report
