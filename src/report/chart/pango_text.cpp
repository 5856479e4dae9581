#include "report/chart/pango_text.hpp"

namespace plumb::report {

TextLayout::TextLayout(cairo_t* cr, const std::string& s, double size, bool bold, bool italic, double wrap) : cr_(cr) {
  ctx_ = pango_cairo_create_context(cr);
  pango_cairo_context_set_resolution(ctx_, 72);
  layout_ = pango_layout_new(ctx_);
  PangoFontDescription* fd = pango_font_description_new();
  pango_font_description_set_family(fd, text_font_family);
  pango_font_description_set_size(fd, static_cast<gint>(size * PANGO_SCALE));
  pango_font_description_set_weight(fd, bold ? PANGO_WEIGHT_BOLD : PANGO_WEIGHT_NORMAL);
  pango_font_description_set_style(fd, italic ? PANGO_STYLE_ITALIC : PANGO_STYLE_NORMAL);
  pango_layout_set_font_description(layout_, fd);
  pango_font_description_free(fd);
  if (wrap > 0) {
    pango_layout_set_width(layout_, static_cast<int>(wrap * PANGO_SCALE));
    pango_layout_set_wrap(layout_, PANGO_WRAP_WORD_CHAR);
  }
  pango_layout_set_text(layout_, s.c_str(), static_cast<int>(s.size()));
}

TextLayout::~TextLayout() {
  g_object_unref(layout_);
  g_object_unref(ctx_);
}

double TextLayout::width() const { return extent().width / double(PANGO_SCALE); }
double TextLayout::height() const { return extent().height / double(PANGO_SCALE); }

void TextLayout::draw(double x, double y) const {
  cairo_move_to(cr_, x, y);
  pango_cairo_update_context(cr_, ctx_);
  pango_layout_context_changed(layout_);
  pango_cairo_show_layout(cr_, layout_);
}

PangoRectangle TextLayout::extent() const {
  PangoRectangle logical;
  pango_layout_get_extents(layout_, nullptr, &logical);
  return logical;
}

cairo_status_t append_to_string_closure(void* closure, const unsigned char* data, unsigned int length) {
  static_cast<std::string*>(closure)->append(reinterpret_cast<const char*>(data), length);
  return CAIRO_STATUS_SUCCESS;
}

}  // namespace plumb::report
