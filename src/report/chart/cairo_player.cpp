#include "report/chart/cairo_player.hpp"

#include <pango/pangocairo.h>

#include <mutex>
#include <numbers>
#include <unordered_map>

#include "report/chart/pango_text.hpp"

namespace plumb::report {
namespace {

void source(cairo_t* cr, const Colour& c) {
  cairo_set_source_rgba(cr, c.r, c.g, c.b, c.a);
}

void shape_path(cairo_t* cr, const Shape& s) {
  cairo_new_path(cr);
  switch (s.kind) {
    case Shape::Kind::rect:
      cairo_rectangle(cr, s.x, s.y, s.w, s.h);
      break;
    case Shape::Kind::circle:
      cairo_new_sub_path(cr);
      cairo_arc(cr, s.x, s.y, s.w, 0, 2 * std::numbers::pi);
      break;
    case Shape::Kind::path:
      for (const auto& sub : s.subpaths) {
        if (sub.empty()) continue;
        cairo_move_to(cr, sub.front().first, sub.front().second);
        for (std::size_t i = 1; i < sub.size(); ++i) cairo_line_to(cr, sub[i].first, sub[i].second);
        if (s.closed) cairo_close_path(cr);
      }
      break;
  }
}

void play_shape(cairo_t* cr, const Shape& s) {
  shape_path(cr, s);
  if (s.fill) {
    source(cr, *s.fill);
    if (s.stroke)
      cairo_fill_preserve(cr);
    else
      cairo_fill(cr);
  }
  if (s.stroke) {
    source(cr, s.stroke->colour);
    cairo_set_line_width(cr, s.stroke->width);
    cairo_set_dash(cr, s.stroke->dash.data(), static_cast<int>(s.stroke->dash.size()), 0);
    cairo_stroke(cr);
    cairo_set_dash(cr, nullptr, 0, 0);
  }
  cairo_new_path(cr);
}

void play_text(cairo_t* cr, const TextLines& t) {
  source(cr, t.colour);
  cairo_save(cr);
  double x = t.x, y = t.y;
  if (t.vertical) {
    cairo_translate(cr, t.x, t.y);
    cairo_rotate(cr, -std::numbers::pi / 2);
    x = 0, y = 0;
  }
  for (std::size_t i = 0; i < t.lines.size(); ++i)
    TextLayout(cr, t.lines[i], t.font.size, t.font.bold, t.font.italic)
        .draw(x, y + t.line_height * static_cast<double>(i));
  cairo_restore(cr);
}

class PangoMeasure final : public TextMeasure {
 public:
  PangoMeasure() {
    ctx_ = pango_font_map_create_context(pango_cairo_font_map_get_default());
    pango_cairo_context_set_resolution(ctx_, 72);
    cairo_font_options_t* options = cairo_font_options_create();
    cairo_font_options_set_hint_metrics(options, CAIRO_HINT_METRICS_OFF);
    cairo_font_options_set_hint_style(options, CAIRO_HINT_STYLE_NONE);
    pango_cairo_context_set_font_options(ctx_, options);
    cairo_font_options_destroy(options);
    for (int i = 0; i < 4; ++i) {
      Face& f = faces_[i];
      f.layout = pango_layout_new(ctx_);
      PangoFontDescription* fd = pango_font_description_new();
      pango_font_description_set_family(fd, text_font_family);
      pango_font_description_set_size(fd, static_cast<gint>(reference_size * PANGO_SCALE));
      pango_font_description_set_weight(fd, (i & 1) != 0 ? PANGO_WEIGHT_BOLD : PANGO_WEIGHT_NORMAL);
      pango_font_description_set_style(fd, (i & 2) != 0 ? PANGO_STYLE_ITALIC : PANGO_STYLE_NORMAL);
      pango_layout_set_font_description(f.layout, fd);
      pango_font_description_free(fd);
      pango_layout_set_text(f.layout, "Hg", 2);
      PangoRectangle logical;
      pango_layout_get_extents(f.layout, nullptr, &logical);
      f.line_height = logical.height / double(PANGO_SCALE) / reference_size;
      f.ascent = pango_layout_get_baseline(f.layout) / double(PANGO_SCALE) / reference_size;
    }
  }
  ~PangoMeasure() override {
    for (auto& f : faces_) g_object_unref(f.layout);
    g_object_unref(ctx_);
  }
  PangoMeasure(const PangoMeasure&) = delete;
  PangoMeasure& operator=(const PangoMeasure&) = delete;

  [[nodiscard]] double width(std::string_view line, const FontSpec& font) const override {
    Face& f = face(font);
    const std::lock_guard lock(mutex_);
    double sum = 0;
    std::size_t i = 0;
    while (i < line.size()) {
      std::size_t n = 1;
      while (i + n < line.size() && (static_cast<unsigned char>(line[i + n]) & 0xC0U) == 0x80U) ++n;
      const std::string ch(line.substr(i, n));
      auto it = f.advance.find(ch);
      if (it == f.advance.end()) {
        pango_layout_set_text(f.layout, ch.c_str(), static_cast<int>(ch.size()));
        PangoRectangle logical;
        pango_layout_get_extents(f.layout, nullptr, &logical);
        it = f.advance.emplace(ch, logical.width / double(PANGO_SCALE) / reference_size).first;
      }
      sum += it->second;
      i += n;
    }
    return sum * font.size;
  }
  [[nodiscard]] double line_height(const FontSpec& font) const override { return face(font).line_height * font.size; }
  [[nodiscard]] double ascent(const FontSpec& font) const override { return face(font).ascent * font.size; }

 private:
  static constexpr double reference_size = 100;  // points: the advances are read at this size and scaled
  struct Face {
    PangoLayout* layout = nullptr;
    double line_height = 0, ascent = 0;               // per point of font size
    std::unordered_map<std::string, double> advance;  // per point of font size, by UTF-8 character
  };
  Face& face(const FontSpec& font) const { return faces_[(font.bold ? 1 : 0) + (font.italic ? 2 : 0)]; }

  PangoContext* ctx_ = nullptr;
  mutable Face faces_[4];
  mutable std::mutex mutex_;
};

}  // namespace

void play_drawing(cairo_t* cr, const Drawing& d) {
  for (const auto& op : d.ops) {
    if (const auto* s = std::get_if<Shape>(&op)) {
      play_shape(cr, *s);
    } else if (const auto* t = std::get_if<TextLines>(&op)) {
      play_text(cr, *t);
    } else if (const auto* c = std::get_if<ClipBegin>(&op)) {
      cairo_save(cr);
      cairo_rectangle(cr, c->x, c->y, c->w, c->h);
      cairo_clip(cr);
    } else {
      cairo_restore(cr);
    }
  }
}

std::unique_ptr<TextMeasure> make_pango_measure() {
  return std::make_unique<PangoMeasure>();
}

}  // namespace plumb::report
