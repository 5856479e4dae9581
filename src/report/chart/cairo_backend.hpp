#pragma once
// The drawing back end on cairo and pango (in the drawing module; linked directly into the tests).
#include "report/chart/drawing_backend.hpp"

namespace plumb::report {

const DrawingBackend& cairo_drawing_backend();

/// The certificate PDF (document/pdf.cpp) and the demo logo (document/demo_logo.cpp), drawn with cairo.
RenderedPdf render_pdf_with_cairo(const Document& doc, const std::function<Drawing(const ChartSpec&)>& lay_out);
void write_demo_logo_with_cairo(const std::filesystem::path& path);

}  // namespace plumb::report

/// The module's one entry point, found by name with dlsym (the only symbol the module exports): the back end,
/// built on the first call.
extern "C" __attribute__((visibility("default"))) const plumb::report::DrawingBackend* plumb_drawing_backend_v1();
