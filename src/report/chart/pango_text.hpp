#pragma once
// One block of text laid out by pango for a cairo context, shared by the chart and document renderers.
// Laid out at 72 dpi so that font sizes are in the same points as cairo's user space on every surface
// (PDF and SVG in points, PNG scaled).
#include <cairo.h>
#include <pango/pangocairo.h>

#include <string>

namespace plumb::report {

inline constexpr const char* text_font_family = "DejaVu Sans";

/// A cairo write function (cairo_write_func_t) that appends to the std::string given as its closure: the PDF
/// and SVG surfaces write into memory, and the caller decides where the bytes go.
cairo_status_t append_to_string_closure(void* closure, const unsigned char* data, unsigned int length);

class TextLayout {
public:
  /// `wrap` > 0 wraps at that width in points.
  TextLayout(cairo_t* cr, const std::string& s, double size, bool bold = false, bool italic = false, double wrap = -1);
  ~TextLayout();
  TextLayout(const TextLayout&) = delete;
  TextLayout& operator=(const TextLayout&) = delete;

  [[nodiscard]] double width() const;
  [[nodiscard]] double height() const;
  /// Draws with the top-left corner at (x, y) in the current transformation.
  void draw(double x, double y) const;

private:
  [[nodiscard]] PangoRectangle extent() const;
  cairo_t* cr_;
  PangoContext* ctx_;
  PangoLayout* layout_;
};

}  // namespace plumb::report
