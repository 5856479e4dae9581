#pragma once
// The one drawing description of a chart: a list of shapes and text lines in points (1/72 in), laid out once
// by the chart renderer and then written by two back ends that add nothing of their own: the SVG writer
// (svg_writer.hpp: real <text>, <path>, <circle>, <rect>) and the cairo player (PNG, PDF, a chart inside a
// certificate). So PNG, PDF and SVG cannot drift apart: they are the same list.
//
// Text is laid out here, not by a back end: lines are already broken (wrap_text) with widths from a
// TextMeasure, so both back ends draw the same lines at the same places.
#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <variant>
#include <vector>

namespace plumb::report {

struct Colour {
  double r = 0, g = 0, b = 0, a = 1.0;
};

struct FontSpec {
  double size = 9;  ///< points
  bool bold = false;
  bool italic = false;
};

struct Stroke {
  Colour colour;
  double width = 1.0;
  std::vector<double> dash;  ///< on, off lengths in points; empty: solid
};

using PointXY = std::pair<double, double>;

/// One filled and/or stroked shape.
struct Shape {
  enum class Kind { path, rect, circle };
  Kind kind = Kind::path;
  /// path: each inner vector is one sub-path (move to its first point, line to the others).
  std::vector<std::vector<PointXY>> subpaths;
  bool closed = false;                ///< path: each sub-path is closed
  double x = 0, y = 0, w = 0, h = 0;  ///< rect: corner and size; circle: centre (x, y) and radius w
  std::optional<Colour> fill;
  std::optional<Stroke> stroke;
};

/// Lines of text, the top of the first at y; each line `line_height` below the one before. Vertical text reads
/// upwards, turned a quarter about (x, y).
struct TextLines {
  double x = 0, y = 0;
  std::vector<std::string> lines;
  FontSpec font;
  Colour colour;
  double line_height = 0;  ///< from the TextMeasure at layout time
  double ascent = 0;       ///< top of the line to its baseline
  bool vertical = false;
  std::string role;  ///< "title", "y-tick", ... (the SVG's class, the tests' handle)
};

/// Everything drawn from a ClipBegin to its ClipEnd is clipped to the rectangle.
struct ClipBegin {
  double x = 0, y = 0, w = 0, h = 0;
};
struct ClipEnd {};

using DrawOp = std::variant<Shape, TextLines, ClipBegin, ClipEnd>;

struct Drawing {
  double width = 0, height = 0;  ///< points
  std::vector<DrawOp> ops;
};

/// Text widths and line heights for layout. The implementation behind the drawing back end reads them from the
/// font (pango); tests may give fixed ones.
class TextMeasure {
 public:
  virtual ~TextMeasure() = default;
  TextMeasure() = default;
  TextMeasure(const TextMeasure&) = delete;
  TextMeasure& operator=(const TextMeasure&) = delete;
  /// Width of one line (no line breaks inside) in points.
  [[nodiscard]] virtual double width(std::string_view line, const FontSpec& font) const = 0;
  [[nodiscard]] virtual double line_height(const FontSpec& font) const = 0;
  [[nodiscard]] virtual double ascent(const FontSpec& font) const = 0;
};

/// Breaks `text` into lines no wider than `wrap` points (wrap <= 0: only at '\n'): at spaces, and inside a
/// word only when the word alone is wider than the line.
std::vector<std::string> wrap_text(const TextMeasure& measure, std::string_view text, const FontSpec& font,
                                   double wrap);

}  // namespace plumb::report
