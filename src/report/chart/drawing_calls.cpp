// The drawn files that go through the drawing back end: the certificate PDF and the demo lab's logo.
#include "report/chart/drawing_backend.hpp"
#include "report/document/demo_logo.hpp"
#include "report/document/pdf.hpp"

namespace plumb::report {

RenderedPdf render_pdf(const Document& doc) {
  const auto& backend = drawing_backend();
  return backend.document_pdf(
      doc, [&backend](const ChartSpec& spec) { return chart_drawing(spec, backend.text_measure()); });
}

void write_demo_logo(const std::filesystem::path& path) {
  drawing_backend().demo_logo(path);
}

}  // namespace plumb::report
