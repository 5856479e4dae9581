#include "report/chart/cairo_backend.hpp"

#include <cairo-pdf.h>
#include <cairo.h>
#include <fmt/format.h>

#include <cmath>
#include <stdexcept>

#include "report/chart/cairo_player.hpp"
#include "report/chart/pango_text.hpp"
#include "report/document/pdf.hpp"

namespace plumb::report {
namespace {

void play_on(cairo_surface_t* surface, const Drawing& d, double scale) {
  cairo_t* cr = cairo_create(surface);
  cairo_scale(cr, scale, scale);
  play_drawing(cr, d);
  const cairo_status_t st = cairo_status(cr);
  cairo_destroy(cr);
  if (st != CAIRO_STATUS_SUCCESS)
    throw std::runtime_error(fmt::format("chart drawing failed: {}", cairo_status_to_string(st)));
}

class CairoBackend final : public DrawingBackend {
 public:
  [[nodiscard]] const TextMeasure& text_measure() const override { return *measure_; }

  [[nodiscard]] std::string png(const Drawing& d, double pixels_per_point) const override {
    std::string out;
    cairo_surface_t* surface =
        cairo_image_surface_create(CAIRO_FORMAT_ARGB32, static_cast<int>(std::ceil(d.width * pixels_per_point)),
                                   static_cast<int>(std::ceil(d.height * pixels_per_point)));
    try {
      play_on(surface, d, pixels_per_point);
    } catch (...) {
      cairo_surface_destroy(surface);
      throw;
    }
    cairo_surface_write_to_png_stream(surface, append_to_string_closure, &out);
    cairo_surface_destroy(surface);
    return out;
  }

  [[nodiscard]] std::string pdf(const Drawing& d, const std::string& title) const override {
    std::string out;
    cairo_surface_t* surface = cairo_pdf_surface_create_for_stream(append_to_string_closure, &out, d.width, d.height);
    cairo_pdf_surface_set_metadata(surface, CAIRO_PDF_METADATA_TITLE, title.c_str());
    cairo_pdf_surface_set_metadata(surface, CAIRO_PDF_METADATA_CREATOR, "plumb");
    try {
      play_on(surface, d, 1.0);
    } catch (...) {
      cairo_surface_destroy(surface);
      throw;
    }
    cairo_surface_finish(surface);
    cairo_surface_destroy(surface);
    return out;
  }

  [[nodiscard]] RenderedPdf document_pdf(const Document& doc,
                                         const std::function<Drawing(const ChartSpec&)>& lay_out) const override {
    return render_pdf_with_cairo(doc, lay_out);
  }

  void demo_logo(const std::filesystem::path& path) const override { write_demo_logo_with_cairo(path); }

 private:
  std::unique_ptr<TextMeasure> measure_ = make_pango_measure();
};

}  // namespace

const DrawingBackend& cairo_drawing_backend() {
  static const CairoBackend backend;
  return backend;
}

}  // namespace plumb::report

extern "C" __attribute__((visibility("default"))) const plumb::report::DrawingBackend* plumb_drawing_backend_v1() {
  return &plumb::report::cairo_drawing_backend();
}
