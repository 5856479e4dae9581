#pragma once
// What needs cairo and pango (fonts, PNG, PDF), behind one interface, so that the plumb binary does not load
// those libraries (and X11, fontconfig, freetype ... behind them) unless a command draws.
//
// The binary loads the back end from a shared module on first use (drawing_loader.cpp, dlopen); the test
// program links the same back end in (drawing_linked.cpp). Either way drawing_backend() returns it.
// doc/charts.md says where the module is looked for.
#include <filesystem>
#include <functional>
#include <string>

#include "report/chart/drawing.hpp"

namespace plumb::report {

struct Document;
struct RenderedPdf;
struct ChartSpec;

class DrawingBackend {
 public:
  virtual ~DrawingBackend() = default;
  DrawingBackend() = default;
  DrawingBackend(const DrawingBackend&) = delete;
  DrawingBackend& operator=(const DrawingBackend&) = delete;

  /// The font's metrics, for laying charts out (also for SVG, so an SVG's lines break where the PNG's do).
  [[nodiscard]] virtual const TextMeasure& text_measure() const = 0;
  /// A drawing as PNG at `pixels_per_point`, or as a one-page PDF titled `title`.
  [[nodiscard]] virtual std::string png(const Drawing& d, double pixels_per_point) const = 0;
  [[nodiscard]] virtual std::string pdf(const Drawing& d, const std::string& title) const = 0;
  /// A certificate document on A4 pages; its charts are laid out by `lay_out` (the chart renderer).
  [[nodiscard]] virtual RenderedPdf document_pdf(const Document& doc,
                                                 const std::function<Drawing(const ChartSpec&)>& lay_out) const = 0;
  /// The invented demo lab's logo as a PNG file.
  virtual void demo_logo(const std::filesystem::path& path) const = 0;
};

/// The back end, loaded on the first call. StorageError when the drawing module cannot be loaded.
const DrawingBackend& drawing_backend();

}  // namespace plumb::report
