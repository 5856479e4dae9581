#include "report/chart/chart.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <functional>
#include <memory>
#include <numbers>
#include <stdexcept>

#include "core/errors.hpp"
#include "report/chart/axis_ticks.hpp"
#include "report/chart/draw_record.hpp"
#include "report/chart/drawing_backend.hpp"
#include "report/chart/svg_writer.hpp"
#include "store/file_output.hpp"

namespace plumb::report {
namespace {

struct Rgb {
  double r, g, b;
};
// Okabe & Ito's colour-blind-safe palette (Okabe and Ito, "Color Universal Design", 2008) for data;
// neutral greys for the frame and grid so the data stand out.
constexpr Rgb ink{0.10, 0.10, 0.10};
constexpr Rgb muted{0.35, 0.35, 0.35};
constexpr Rgb grid_grey{0.87, 0.87, 0.87};
constexpr Rgb series_colours[] = {{0.000, 0.447, 0.698}, {0.902, 0.624, 0.000}, {0.337, 0.706, 0.914},
                                  {0.000, 0.000, 0.000}};
constexpr Rgb tolerance_colour{0.835, 0.369, 0.000};  // vermillion
constexpr Rgb tolerance_fill{0.94, 0.98, 0.94};        // the allowed region, faintly green
constexpr Rgb control_colour{0.000, 0.620, 0.451};    // bluish green
constexpr Rgb trend_colour{0.800, 0.475, 0.655};      // reddish purple
constexpr Rgb band_fill{0.96, 0.90, 0.94};
constexpr Rgb baseline_fill{0.90, 0.93, 0.97};  // a pale blue-grey: behind the data, unlike the allowed region

constexpr double margin = 16;
constexpr double legend_width = 210;
constexpr double point_radius = 3.6;
constexpr double flag_radius = 7.5;

std::string svg_number(double v) { return fmt::format("{:.6g}", v); }

const char* outcome_key(ChartPoint::Outcome o) {
  switch (o) {
    case ChartPoint::Outcome::failed:
      return "failed";
    case ChartPoint::Outcome::void_run:
      return "void";
    case ChartPoint::Outcome::pass:
      break;
  }
  return "pass";
}
std::string px(double v) { return fmt::format("{:.2f}", v); }

void require_finite(double v, std::string_view field) {
  if (!std::isfinite(v)) throw InputError(fmt::format("chart {} is {}; it must be a finite number.", field, v));
}

void validate(const ChartSpec& s) {
  if (s.title.empty()) throw InputError("chart title is empty; name the instrument, the quantity and the period.");
  if (s.x.label.empty()) throw InputError("chart x axis label is empty; name the quantity on the x axis.");
  if (s.y.label.empty()) throw InputError("chart y axis label is empty; name the quantity and its unit.");
  if (!(s.width >= 320 && s.height >= 240))
    throw InputError(fmt::format("chart size {} x {} is too small; use at least 320 x 240 points.", s.width,
                                 s.height));
  for (const auto& series : s.series)
    for (std::size_t i = 0; i < series.points.size(); ++i) {
      const auto& p = series.points[i];
      const std::string where = fmt::format("point {} of series \"{}\"", i + 1, series.name);
      require_finite(p.x, where + " x");
      require_finite(p.y, where + " y");
      if (p.error && !(std::isfinite(*p.error) && *p.error >= 0))
        throw InputError(fmt::format("chart {} has error bar {}; it must be a finite number >= 0.", where, *p.error));
    }
  if (s.x_range &&
      !(std::isfinite(s.x_range->first) && std::isfinite(s.x_range->second) && s.x_range->first < s.x_range->second))
    throw InputError(fmt::format("chart x range {} to {} is empty; the end must be above the start.", s.x_range->first,
                                 s.x_range->second));
  if (s.tolerance && s.tolerance->lower && s.tolerance->upper && *s.tolerance->lower >= *s.tolerance->upper)
    throw InputError(fmt::format("chart tolerance lower limit {} is not below the upper limit {}.",
                                 *s.tolerance->lower, *s.tolerance->upper));
}

struct Range {
  double lo = INFINITY, hi = -INFINITY;
  void add(double v) {
    lo = std::min(lo, v);
    hi = std::max(hi, v);
  }
  [[nodiscard]] bool empty() const { return lo > hi; }
};

// The y values the data need (points with error bars, zero, control lines, the fitted trend over the observed
// span, model curves) and those the limits add (tolerance, limit curves, the extrapolated trend and its band).
struct YRanges {
  Range data, limits;
};

YRanges y_ranges(const ChartSpec& s) {
  YRanges r;
  for (const auto& series : s.series)
    for (const auto& p : series.points) {
      r.data.add(p.y - p.error.value_or(0));
      r.data.add(p.y + p.error.value_or(0));
    }
  if (s.zero_line) r.data.add(0);
  if (s.control) r.data.add(s.control->lower), r.data.add(s.control->upper);
  if (s.trend) {
    const auto& t = *s.trend;
    r.data.add(t.y0), r.data.add(t.y1);
    for (const auto& b : t.prediction_band) {
      Range& into = b.x <= t.x1 ? r.data : r.limits;
      into.add(b.lower), into.add(b.upper);
    }
    if (t.y_extrapolated) r.limits.add(*t.y_extrapolated);
  }
  for (const auto& c : s.curves)
    for (const auto& [x, y] : c.points) (c.style == ChartCurve::Style::model ? r.data : r.limits).add(y);
  if (s.tolerance) {
    if (s.tolerance->lower) r.limits.add(*s.tolerance->lower);
    if (s.tolerance->upper) r.limits.add(*s.tolerance->upper);
  }
  return r;
}

// Two significant digits: "400", "37", "2.5"; a ratio, not a measurement.
std::string ratio_text(double r) {
  const double p = std::pow(10.0, std::floor(std::log10(r)) - 1);
  return fmt::format("{:.6g}", std::round(r / p) * p);
}

std::string signed_text(double v, const std::string& unit) {
  return fmt::format("{:+.4g}{}", v, unit.empty() ? "" : " " + unit);
}

// Text laid out for the drawing: its lines, its size and the metrics the back ends place it by.
struct LaidText {
  std::vector<std::string> lines;
  FontSpec font;
  double w = 0, h = 0, line_height = 0, ascent = 0;
  [[nodiscard]] double width() const { return w; }
  [[nodiscard]] double height() const { return h; }
};

Colour colour_of(Rgb c, double alpha = 1.0) {
  return {c.r, c.g, c.b, alpha};
}

class Renderer {
public:
 Renderer(const TextMeasure& m, const ChartSpec& s, DrawRecord& rec, Drawing& out)
     : m_(m), s_(s), rec_(rec), out_(out) {}

 void draw() {
   out_.width = s_.width;
   out_.height = s_.height;
   fill_rect(0, 0, s_.width, s_.height, colour_of({1, 1, 1}));
   double y = margin;
   y = heading(y);
   layout(y);
   plot_background();
   grid();
   data_layers();
   axes_text();
   legend();
   notes();
  }

private:
 // ---- drawing primitives: each appends one operation to the drawing ------------------------------
 [[nodiscard]] LaidText lay(const std::string& text, double size, bool bold = false, bool italic = false,
                            double wrap = -1) const {
   LaidText t;
   t.font = {size, bold, italic};
   t.lines = wrap_text(m_, text, t.font, wrap);
   t.line_height = m_.line_height(t.font);
   t.ascent = m_.ascent(t.font);
   for (const auto& l : t.lines) t.w = std::max(t.w, m_.width(l, t.font));
   t.h = t.line_height * static_cast<double>(t.lines.size());
   return t;
 }
 void put(const LaidText& t, double x, double y, Rgb c, const std::string& role, bool vertical = false,
          double alpha = 1.0) {
   out_.ops.emplace_back(
       TextLines{x, y, t.lines, t.font, colour_of(c, alpha), t.line_height, t.ascent, vertical, role});
 }
 void fill_rect(double x, double y, double w, double h, Colour c) {
   Shape r;
   r.kind = Shape::Kind::rect;
   r.x = x, r.y = y, r.w = w, r.h = h;
   r.fill = c;
   out_.ops.emplace_back(std::move(r));
 }
 void stroke_rect(double x, double y, double w, double h, Stroke st) {
   Shape r;
   r.kind = Shape::Kind::rect;
   r.x = x, r.y = y, r.w = w, r.h = h;
   r.stroke = std::move(st);
   out_.ops.emplace_back(std::move(r));
 }
 void stroke_lines(std::vector<std::vector<PointXY>> subpaths, Stroke st) {
   if (subpaths.empty()) return;
   Shape p;
   p.subpaths = std::move(subpaths);
   p.stroke = std::move(st);
   out_.ops.emplace_back(std::move(p));
 }
 void fill_polygon(std::vector<PointXY> points, Colour c) {
   Shape p;
   p.subpaths.push_back(std::move(points));
   p.closed = true;
   p.fill = c;
   out_.ops.emplace_back(std::move(p));
 }
 void circle(double cx, double cy, double r, std::optional<Colour> fill, std::optional<Stroke> stroke = {}) {
   Shape c;
   c.kind = Shape::Kind::circle;
   c.x = cx, c.y = cy, c.w = r;
   c.fill = fill;
   c.stroke = std::move(stroke);
   out_.ops.emplace_back(std::move(c));
 }
 static Stroke pen(Rgb c, double width, std::vector<double> dash = {}, double alpha = 1.0) {
   return {colour_of(c, alpha), width, std::move(dash)};
 }

  // ---- layout -------------------------------------------------------------------------------------
  double heading(double y) {
    const auto title = lay(s_.title, 15, true, false, s_.width - 2 * margin);
    put(title, margin, y, ink, "title");
    rec_.add("text", {{"role", "title"}}, s_.title);
    y += title.height() + 2;
    if (!s_.subtitle.empty()) {
      const auto sub = lay(s_.subtitle, 10.5, false, false, s_.width - 2 * margin);
      put(sub, margin, y, muted, "subtitle");
      rec_.add("text", {{"role", "subtitle"}}, s_.subtitle);
      y += sub.height();
    }
    if (scale_.zoomed) {
      // Said where the reader looks first, in the limit colour: the axis is not the full tolerance band.
      const auto zoom = lay(scale_.statement, 10.5, true, false, s_.width - 2 * margin);
      put(zoom, margin, y, tolerance_colour, "zoom-statement");
      rec_.add("scale", {{"zoomed", "true"}, {"ratio", ratio_text(scale_.ratio)}});
      rec_.add("text", {{"role", "zoom-statement"}}, scale_.statement);
      y += zoom.height();
    }
    return y + 14;
  }

  void layout(double top) {
    Range xr;
    for (const auto& series : s_.series)
      for (const auto& p : series.points) xr.add(p.x);
    if (s_.trend) {
      const auto& t = *s_.trend;
      xr.add(t.x0), xr.add(t.x1);
      if (t.x_extrapolated) xr.add(*t.x_extrapolated);
      for (const auto& b : t.prediction_band) xr.add(b.x);
    }
    for (const auto& c : s_.curves)
      for (const auto& pt : c.points) xr.add(pt.first);
    // Honest scaling: every point with its error bar, the zero line, control lines and the fitted trend are
    // always in view; the limits and the extrapolated trend too, unless the chart is zoomed to the data
    // (scale_decision), when the limits left out are marked at the edge of the plot.
    const YRanges ranges = y_ranges(s_);
    Range yr = ranges.data;
    if (!scale_.zoomed && !ranges.limits.empty()) yr.add(ranges.limits.lo), yr.add(ranges.limits.hi);
    if (xr.empty()) xr.add(0), xr.add(1);
    if (yr.empty()) yr.add(0), yr.add(1);
    // A little air so that no point sits on the frame.
    const double ypad = 0.04 * (yr.hi - yr.lo), xpad = 0.03 * (xr.hi - xr.lo);
    // A quantity that cannot be negative never gets a negative axis: the air below is dropped at zero.
    const double y_lo = s_.y_non_negative ? std::max(0.0, yr.lo - ypad) : yr.lo - ypad;
    yt_ = number_ticks(y_lo, yr.hi + ypad, 6);

    double widest_y = 0;
    for (const auto& t : yt_.ticks) widest_y = std::max(widest_y, m_.width(t.label, {9}));
    const double y_label_h = m_.line_height({10.5});
    left_ = margin + y_label_h + 8 + widest_y + 6;
    right_ = s_.width - margin - legend_width - 18;
    top_ = top;
    // Notes may take at most a third of the height, so the plot never shrinks away; the rest are
    // counted in a last line that says where to read them.
    notes_h_ = 0;
    shown_notes_.clear();
    const double wrap = s_.width - 2 * margin;
    for (std::size_t i = 0; i < s_.notes.size(); ++i) {
      const double h = lay(s_.notes[i], 8, false, false, wrap).height();
      if (notes_h_ + 2 * h > s_.height / 3 && i + 1 < s_.notes.size()) {
        shown_notes_.push_back(fmt::format("({} further note(s) are in the text report.)", s_.notes.size() - i));
        notes_h_ += lay(shown_notes_.back(), 8, false, false, wrap).height();
        break;
      }
      shown_notes_.push_back(s_.notes[i]);
      notes_h_ += h;
    }
    const double tick_h = m_.line_height({9});
    const double x_label_h = m_.line_height({10.5});
    bottom_ = s_.height - margin - notes_h_ - (notes_h_ > 0 ? 8 : 0) - x_label_h - 6 - tick_h - 6;

    const double plot_w = right_ - left_;
    if (s_.x_range) {
      // A stated range (0 to the capacity): ticks inside it only, the frame exactly at its ends.
      const int target = std::max(2, std::min(8, static_cast<int>(plot_w / 70)));
      xt_ = number_ticks(s_.x_range->first, s_.x_range->second, target);
      xt_.min = s_.x_range->first;
      xt_.max = s_.x_range->second;
      std::erase_if(xt_.ticks, [this](const auto& t) {
        return t.value < xt_.min - 1e-9 * xt_.step || t.value > xt_.max + 1e-9 * xt_.step;
      });
    } else if (s_.x.scale == AxisScale::date) {
      const double label_w = m_.width("2024-12-31", {9});
      const int max_ticks = std::max(2, static_cast<int>(plot_w / (label_w + 18)));
      xt_ = date_ticks(xr.lo - xpad, xr.hi + xpad, max_ticks);
    } else {
      const int target = std::max(2, std::min(8, static_cast<int>(plot_w / 70)));
      xt_ = number_ticks(xr.lo - xpad, xr.hi + xpad, target);
    }
    rec_.add("plot", {{"left", px(left_)}, {"right", px(right_)}, {"top", px(top_)}, {"bottom", px(bottom_)},
                      {"x-min", svg_number(xt_.min)}, {"x-max", svg_number(xt_.max)}, {"y-min", svg_number(yt_.min)},
                      {"y-max", svg_number(yt_.max)}});
  }

  [[nodiscard]] double X(double x) const { return left_ + (x - xt_.min) / (xt_.max - xt_.min) * (right_ - left_); }
  [[nodiscard]] double Y(double y) const { return bottom_ - (y - yt_.min) / (yt_.max - yt_.min) * (bottom_ - top_); }

  // ---- plot area ----------------------------------------------------------------------------------
  void plot_background() {
    if (!s_.tolerance || (!s_.tolerance->lower && !s_.tolerance->upper)) return;
    // Clamped to the plot: a zoomed chart may lie wholly inside the band.
    const double hi = std::clamp(s_.tolerance->upper ? Y(*s_.tolerance->upper) : top_, top_, bottom_);
    const double lo = std::clamp(s_.tolerance->lower ? Y(*s_.tolerance->lower) : bottom_, top_, bottom_);
    fill_rect(left_, hi, right_ - left_, lo - hi, colour_of(tolerance_fill));
  }

  void grid() {
    std::vector<std::vector<PointXY>> lines;
    lines.reserve(yt_.ticks.size() + xt_.ticks.size());
    for (const auto& t : yt_.ticks) lines.push_back({{left_, Y(t.value)}, {right_, Y(t.value)}});
    for (const auto& t : xt_.ticks) lines.push_back({{X(t.value), top_}, {X(t.value), bottom_}});
    stroke_lines(std::move(lines), pen(grid_grey, 0.6));
    stroke_rect(left_, top_, right_ - left_, bottom_ - top_, pen(muted, 0.8));
  }

  void hline(double y, Rgb c, double width, bool dashed) {
    stroke_lines({{{left_, Y(y)}, {right_, Y(y)}}},
                 pen(c, width, dashed ? std::vector<double>{5, 3} : std::vector<double>{}));
  }

  void data_layers() {
    out_.ops.emplace_back(ClipBegin{left_, top_, right_ - left_, bottom_ - top_});
    if (s_.baseline) baseline_span(*s_.baseline);
    if (s_.zero_line) {
      hline(0, ink, 0.9, false);
      rec_.add("zero-line", {{"py", px(Y(0))}});
    }
    if (s_.trend && s_.trend->prediction_band.size() >= 2) {
      const auto& b = s_.trend->prediction_band;
      std::vector<PointXY> outline;
      outline.reserve(2 * b.size());
      for (const auto& p : b) outline.emplace_back(X(p.x), Y(p.upper));
      for (auto it = b.rbegin(); it != b.rend(); ++it) outline.emplace_back(X(it->x), Y(it->lower));
      fill_polygon(std::move(outline), colour_of(band_fill));
      rec_.add("prediction-band", {{"points", std::to_string(b.size())}});
    }
    if (s_.tolerance) {
      for (const auto& [side, v] : {std::pair{"lower", s_.tolerance->lower}, std::pair{"upper", s_.tolerance->upper}}) {
        if (!v) continue;
        if (in_view(*v)) {
          hline(*v, tolerance_colour, 1.6, false);
          rec_.add("tolerance-limit", {{"side", side}, {"value", svg_number(*v)}, {"py", px(Y(*v))}});
        } else {
          off_scale(*v > yt_.max, fmt::format("{} limit {}, off scale", side, signed_text(*v, s_.y.unit)), *v);
        }
      }
    }
    for (const auto& c : s_.curves) curve(c);
    if (s_.control) {
      hline(s_.control->centre, control_colour, 1.1, false);
      hline(s_.control->upper, control_colour, 1.1, true);
      hline(s_.control->lower, control_colour, 1.1, true);
      rec_.add("control-lines", {{"centre", svg_number(s_.control->centre)},
                                 {"lower", svg_number(s_.control->lower)},
                                 {"upper", svg_number(s_.control->upper)}});
    }
    if (s_.trend) trend();
    for (const auto& m : s_.markers) marker_line(m);
    std::size_t k = 0;
    for (const auto& series : s_.series) {
      const Rgb c = series_colours[k++ % std::size(series_colours)];
      // Layer by layer (bars, markers, rings), so that the SVG writes each layer as one group.
      for (const auto& p : series.points) error_bar(p, c);
      for (const auto& p : series.points) point(series.name, p, c);
      for (const auto& p : series.points)
        if (p.flagged) circle(X(p.x), Y(p.y), flag_radius, std::nullopt, pen(tolerance_colour, 1.8));
    }
    out_.ops.emplace_back(ClipEnd{});
  }

  // The baseline behind everything, widened by a few points so that its first and last results sit inside it;
  // labelled near the top of the plot so that the reader sees which results set the limits.
  void baseline_span(const XSpan& b) {
    const double x0 = X(b.from) - 4, x1 = X(b.to) + 4;
    fill_rect(x0, top_, x1 - x0, bottom_ - top_, colour_of(baseline_fill));
    const auto t = lay(b.label, 8.5, false, false, std::max(60.0, x1 - x0 - 6));
    put(t, x0 + 3, top_ + 24, muted, "baseline-label");  // below the band an off-scale limit's label may take
    rec_.add("baseline",
             {{"from", svg_number(b.from)}, {"to", svg_number(b.to)}, {"px-from", px(x0)}, {"px-to", px(x1)}});
    rec_.add("text", {{"role", "baseline-label"}}, b.label);
  }

  // An adjustment: a dashed vertical in ink across the plot with its label at the top, turned to read upwards
  // so that two adjustments close together do not overprint.
  void marker_line(const XMarker& m) {
    const double x = X(m.x);
    stroke_lines({{{x, top_}, {x, bottom_}}}, pen(ink, 1.2, {5, 3}));
    const auto t = lay(m.label, 8.5);
    put(t, x - t.height() - 1, top_ + 4 + t.width(), ink, "adjustment-label", true);
    rec_.add("adjustment", {{"x", svg_number(m.x)}, {"px", px(x)}});
    rec_.add("text", {{"role", "adjustment-label"}}, m.label);
  }

  [[nodiscard]] bool in_view(double y) const { return y >= yt_.min && y <= yt_.max; }

  // A limit beyond the zoomed axis: a dashed edge, an arrowhead pointing out of the plot and a label saying
  // which limit and where it is, so the reader knows the band goes on past the frame.
  void off_scale(bool top, const std::string& label, double value) {
    const double edge = top ? top_ + 1.5 : bottom_ - 1.5;
    stroke_lines({{{left_, edge}, {right_, edge}}}, pen(tolerance_colour, 2.2, {6, 4}));
    double& x = top ? top_marker_x_ : bottom_marker_x_;
    if (x == 0) x = left_ + 8;
    const double dir = top ? -1 : 1;  // the arrow points away from the data, towards the limit
    const double tip = edge + dir * 0.5, base = edge - dir * 9;
    fill_polygon({{x, tip}, {x - 5, base}, {x + 5, base}}, colour_of(tolerance_colour));
    const auto t = lay(label, 9, true);
    const double ty = top ? edge + 3 : edge - 3 - t.height();
    fill_rect(x + 8, ty, t.width() + 6, t.height(), colour_of({1, 1, 1}, 0.85));
    put(t, x + 11, ty, tolerance_colour, "off-scale-label");
    rec_.add("off-scale-limit", {{"edge", top ? "top" : "bottom"}, {"value", svg_number(value)}, {"py", px(edge)}});
    rec_.add("text", {{"role", "off-scale-label"}}, label);
    x += t.width() + 30;
  }

  void curve(const ChartCurve& c) {
    if (c.points.size() < 2) return;
    const bool limit = c.style == ChartCurve::Style::limit;
    const bool step = c.style == ChartCurve::Style::step_limit;
    const Rgb colour = limit || step ? tolerance_colour : trend_colour;
    // A limit known at some points only: a bold bar at each point, joined by a thin dotted guide, so that no
    // slope between two points is read as a limit nobody stated.
    std::vector<PointXY> line;
    line.reserve(c.points.size());
    for (const auto& [x, y] : c.points) line.emplace_back(X(x), Y(y));
    stroke_lines({std::move(line)}, pen(colour,
                                        limit  ? 0.9
                                        : step ? 1.6
                                               : 2.0,
                                        limit ? std::vector<double>{1.5, 2.5} : std::vector<double>{}));
    if (limit) {
      std::vector<std::vector<PointXY>> bars;
      bars.reserve(c.points.size());
      for (const auto& [x, y] : c.points) bars.push_back({{X(x) - 9, Y(y)}, {X(x) + 9, Y(y)}});
      stroke_lines(std::move(bars), pen(colour, 2.4));
    }
    rec_.add("curve", {{"name", c.name},
                       {"style", limit  ? "limit"
                                 : step ? "step-limit"
                                        : "model"},
                       {"points", std::to_string(c.points.size())}});
    if (step) {
      // Each vertex is recorded so that a test can read the steps back: x, y in data units.
      for (const auto& [x, y] : c.points)
        rec_.add("curve-vertex", {{"curve", c.name}, {"x", svg_number(x)}, {"y", svg_number(y)}});
    }
    if (!limit && !step) return;
    double hi = -INFINITY, lo = INFINITY;
    for (const auto& pt : c.points) hi = std::max(hi, pt.second), lo = std::min(lo, pt.second);
    if (hi > yt_.max) off_scale(true, fmt::format("{} up to {}, off scale", c.name, signed_text(hi, s_.y.unit)), hi);
    if (lo < yt_.min) off_scale(false, fmt::format("{} down to {}, off scale", c.name, signed_text(lo, s_.y.unit)), lo);
  }

  void trend() {
    const auto& t = *s_.trend;
    stroke_lines({{{X(t.x0), Y(t.y0)}, {X(t.x1), Y(t.y1)}}}, pen(trend_colour, 2.0));
    rec_.add("trend", {{"x0", svg_number(t.x0)}, {"y0", svg_number(t.y0)}, {"x1", svg_number(t.x1)}, {"y1", svg_number(t.y1)}});
    if (!(t.x_extrapolated && t.y_extrapolated)) return;
    stroke_lines({{{X(t.x1), Y(t.y1)}, {X(*t.x_extrapolated), Y(*t.y_extrapolated)}}}, pen(trend_colour, 2.0, {7, 4}));
    rec_.add("extrapolated", {{"x0", svg_number(t.x1)}, {"y0", svg_number(t.y1)}, {"x1", svg_number(*t.x_extrapolated)},
                              {"y1", svg_number(*t.y_extrapolated)}, {"dashed", "true"}});
    // The word sits above the middle of the dashed part (below it when there is no room above),
    // kept inside the plot so it is never clipped.
    const auto word = lay("extrapolated", 9, false, true);
    const double mx = (X(t.x1) + X(*t.x_extrapolated)) / 2, my = (Y(t.y1) + Y(*t.y_extrapolated)) / 2;
    const double tx = std::clamp(mx - word.width() / 2, left_ + 3, right_ - word.width() - 3);
    double ty = my - word.height() - 6;
    if (ty < top_ + 2) ty = my + 6;
    put(word, tx, ty, trend_colour, "extrapolated-label");
    rec_.add("text", {{"role", "extrapolated-label"}}, "extrapolated");
  }

  void error_bar(const ChartPoint& p, Rgb c) {
    if (!p.error || *p.error <= 0) return;
    const double x = X(p.x), y0 = Y(p.y - *p.error), y1 = Y(p.y + *p.error);
    stroke_lines({{{x, y0}, {x, y1}}, {{x - 3, y0}, {x + 3, y0}}, {{x - 3, y1}, {x + 3, y1}}}, pen(c, 1.0, {}, 0.85));
    // Kept short: a long history has hundreds; the point's own entry says where it is.
    rec_.add("error-bar", {{"u", svg_number(*p.error)}});
  }

  void point(const std::string& series, const ChartPoint& p, Rgb c) {
    marker(p.outcome, X(p.x), Y(p.y), c);
    // x, y in data units; where they are drawn follows from the plot entry (left + (x - x-min) / (x-max - x-min) *
    // (right - left)), so the positions are not repeated for every point of a long history.
    std::vector<std::pair<std::string, std::string>> a{
        {"series", series}, {"x", svg_number(p.x)}, {"y", svg_number(p.y)}, {"outcome", outcome_key(p.outcome)}};
    if (p.flagged) a.emplace_back("flagged", "true");
    rec_.add("point", std::move(a));
  }

  // A pass is a filled dot; a failed run a bold cross; a void run an open square: the shape tells them apart
  // in grey print and for readers who do not see the colours.
  void marker(ChartPoint::Outcome o, double x, double y, Rgb c) {
    if (o == ChartPoint::Outcome::failed) {
      const double r = point_radius + 1.5;
      stroke_lines({{{x - r, y - r}, {x + r, y + r}}, {{x - r, y + r}, {x + r, y - r}}}, pen(c, 2.4));
    } else if (o == ChartPoint::Outcome::void_run) {
      const double r = point_radius + 0.5;
      stroke_rect(x - r, y - r, 2 * r, 2 * r, pen(c, 1.6));
    } else {
      // The dot with a white halo 0.8 wide around it: one circle, stroked white across its edge.
      circle(x, y, point_radius + 0.4, colour_of(c), pen({1, 1, 1}, 0.8));
    }
  }

  // ---- text around the plot -----------------------------------------------------------------------
  void axes_text() {
    for (const auto& t : yt_.ticks) {
      const auto l = lay(t.label, 9);
      put(l, left_ - 6 - l.width(), Y(t.value) - l.height() / 2, ink, "y-tick");
      rec_.add("text", {{"role", "y-tick"}, {"value", svg_number(t.value)}}, t.label);
    }
    double tick_bottom = bottom_;
    for (const auto& t : xt_.ticks) {
      const auto l = lay(t.label, 9);
      const double cx = std::clamp(X(t.value) - l.width() / 2, 2.0, s_.width - l.width() - 2);
      put(l, cx, bottom_ + 6, ink, "x-tick");
      tick_bottom = std::max(tick_bottom, bottom_ + 6 + l.height());
      rec_.add("text", {{"role", "x-tick"}, {"value", svg_number(t.value)}}, t.label);
    }
    const auto xl = lay(s_.x.text(), 10.5);
    put(xl, (left_ + right_) / 2 - xl.width() / 2, tick_bottom + 6, ink, "x-axis-label");
    rec_.add("text", {{"role", "x-axis-label"}}, s_.x.text());

    const auto yl = lay(s_.y.text(), 10.5);
    put(yl, margin, (top_ + bottom_) / 2 + yl.width() / 2, ink, "y-axis-label", true);
    rec_.add("text", {{"role", "y-axis-label"}}, s_.y.text());
  }

  double legend_entry(double y, const std::function<void(double, double)>& symbol, const std::string& text) {
    const double x = right_ + 18;
    const auto t = lay(text, 9, false, false, legend_width - 30);
    symbol(x + 10, y + std::min(t.height(), 12.0) / 2);
    put(t, x + 26, y, ink, "legend");
    rec_.add("text", {{"role", "legend"}}, text);
    return y + t.height() + 5;
  }

  std::function<void(double, double)> line_symbol(Rgb c, double width, bool dashed) {
    return [this, c, width, dashed](double x, double y) {
      stroke_lines({{{x - 10, y}, {x + 10, y}}},
                   pen(c, width, dashed ? std::vector<double>{4, 2.5} : std::vector<double>{}));
    };
  }

  std::function<void(double, double)> swatch(Rgb c) {
    return [this, c](double x, double y) { fill_rect(x - 10, y - 5, 20, 10, colour_of(c)); };
  }

  [[nodiscard]] std::string with_unit(double v) const {
    return s_.y.unit.empty() ? fmt::format("{:.4g}", v) : fmt::format("{:.4g} {}", v, s_.y.unit);
  }

  void legend() {
    double y = top_;
    std::size_t k = 0;
    bool any_error = false, any_flag = false;
    for (const auto& series : s_.series) {
      const Rgb c = series_colours[k++ % std::size(series_colours)];
      // A series of one kind (all void, say) shows that marker; a mixed one its passes and then each other kind.
      bool failed = false, void_run = false, passed = series.points.empty();
      for (const auto& p : series.points) {
        failed = failed || p.outcome == ChartPoint::Outcome::failed;
        void_run = void_run || p.outcome == ChartPoint::Outcome::void_run;
        passed = passed || p.outcome == ChartPoint::Outcome::pass;
      }
      const auto own = passed   ? ChartPoint::Outcome::pass
                       : failed ? ChartPoint::Outcome::failed
                                : ChartPoint::Outcome::void_run;
      y = legend_entry(
          y, [this, c, own](double x, double yy) { marker(own, x, yy, c); }, series.name);
      if (own == ChartPoint::Outcome::failed) failed = false;
      if (own == ChartPoint::Outcome::void_run) void_run = false;
      if (failed)
        y = legend_entry(
            y, [this, c](double x, double yy) { marker(ChartPoint::Outcome::failed, x, yy, c); },
            series.name + ": failed run");
      if (void_run)
        y = legend_entry(
            y, [this, c](double x, double yy) { marker(ChartPoint::Outcome::void_run, x, yy, c); },
            series.name + ": void run (not used in the statistics)");
      for (const auto& p : series.points) {
        any_error = any_error || (p.error && *p.error > 0);
        any_flag = any_flag || p.flagged;
      }
    }
    if (any_error)
      y = legend_entry(
          y,
          [this](double x, double yy) {
            stroke_lines(
                {{{x, yy - 6}, {x, yy + 6}}, {{x - 3, yy - 6}, {x + 3, yy - 6}}, {{x - 3, yy + 6}, {x + 3, yy + 6}}},
                pen(muted, 1.0));
          },
          "error bar: expanded uncertainty U");
    if (any_flag)
      y = legend_entry(
          y,
          [this](double x, double yy) { circle(x, yy, flag_radius - 1.5, std::nullopt, pen(tolerance_colour, 1.8)); },
          "flagged point (see the notes)");
    if (s_.tolerance) {
      std::string t = s_.tolerance->label;
      if (s_.tolerance->lower && s_.tolerance->upper)
        t += fmt::format("s {} and {}", with_unit(*s_.tolerance->lower), with_unit(*s_.tolerance->upper));
      else if (s_.tolerance->upper)
        t += " (upper) " + with_unit(*s_.tolerance->upper);
      else if (s_.tolerance->lower)
        t += " (lower) " + with_unit(*s_.tolerance->lower);
      const bool off = (s_.tolerance->lower && !in_view(*s_.tolerance->lower)) ||
                       (s_.tolerance->upper && !in_view(*s_.tolerance->upper));
      y = legend_entry(y, line_symbol(tolerance_colour, 1.6, false), off ? t + " (off scale, marked at the edge)" : t);
    }
    std::vector<std::string> named;  // an upper and a lower limit curve share one legend entry
    for (const auto& c : s_.curves) {
      if (std::find(named.begin(), named.end(), c.name) != named.end()) continue;
      named.push_back(c.name);
      const bool limit = c.style != ChartCurve::Style::model;
      y = legend_entry(y, line_symbol(limit ? tolerance_colour : trend_colour, limit ? 1.6 : 2.0, false), c.name);
    }
    if (s_.control) {
      y = legend_entry(y, line_symbol(control_colour, 1.1, false), "centre line " + with_unit(s_.control->centre));
      y = legend_entry(y, line_symbol(control_colour, 1.1, true),
                       fmt::format("control limits (3 sigma) {} and {}", with_unit(s_.control->lower),
                                   with_unit(s_.control->upper)));
    }
    if (s_.zero_line) y = legend_entry(y, line_symbol(ink, 0.9, false), "zero");
    if (s_.baseline)
      y = legend_entry(y, swatch(baseline_fill), "baseline period (sets centre line and control limits)");
    if (!s_.markers.empty())
      y = legend_entry(
          y,
          [this](double x, double yy) {
            stroke_lines({{{x, yy - 6}, {x, yy + 6}}}, pen(ink, 1.2));
          },
          "adjustment (as found / as left)");
    if (s_.trend) {
      y = legend_entry(y, line_symbol(trend_colour, 2.0, false), "trend (least squares)");
      if (s_.trend->x_extrapolated) y = legend_entry(y, line_symbol(trend_colour, 2.0, true), "trend, extrapolated");
      if (s_.trend->prediction_band.size() >= 2) y = legend_entry(y, swatch(band_fill), s_.trend->band_label);
      if (!s_.trend->label.empty()) {
        put(lay(s_.trend->label, 9, false, false, legend_width - 8), right_ + 18, y + 6, ink, "trend-label");
        rec_.add("text", {{"role", "trend-label"}}, s_.trend->label);
      }
    }
  }

  void notes() {
    double y = s_.height - margin - notes_h_;
    for (const auto& n : shown_notes_) {
      const auto t = lay(n, 8, false, false, s_.width - 2 * margin);
      put(t, margin, y, muted, "note");
      rec_.add("text", {{"role", "note"}}, n);
      y += t.height();
    }
  }

  const TextMeasure& m_;
  const ChartSpec& s_;
  DrawRecord& rec_;
  Drawing& out_;
  ScaleDecision scale_ = scale_decision(s_);
  double top_marker_x_ = 0, bottom_marker_x_ = 0;
  AxisTicks xt_, yt_;
  double left_ = 0, right_ = 0, top_ = 0, bottom_ = 0, notes_h_ = 0;
  std::vector<std::string> shown_notes_;
};

std::string description(const ChartSpec& s) {
  std::size_t points = 0;
  for (const auto& series : s.series) points += series.points.size();
  return fmt::format("{}{}x axis: {}; y axis: {}; {} point(s).", s.subtitle, s.subtitle.empty() ? "" : ". ",
                     s.x.text(), s.y.text(), points);
}

}  // namespace

ScaleDecision scale_decision(const ChartSpec& s) {
  const YRanges r = y_ranges(s);
  if (s.full_scale || r.data.empty() || r.limits.empty()) return {};
  // The band is measured from zero, so that a one-sided limit (s <= 5 mg) counts as the distance to it.
  Range band = r.limits;
  band.add(0);
  const double data_span = r.data.hi - r.data.lo, band_width = band.hi - band.lo;
  if (!(data_span > 0) || band_width <= zoom_threshold * data_span) return {};
  ScaleDecision d{true, band_width / data_span, ""};
  const std::string unit = s.y.unit.empty() ? "" : " " + s.y.unit;
  std::string band_text;
  const auto& t = s.tolerance;
  if (t && t->lower && t->upper && std::abs(*t->lower + *t->upper) <= 1e-9 * band_width)
    band_text = fmt::format("the tolerance band \u00b1{:.4g}{} is", *t->upper, unit);
  else if (t && t->lower && t->upper)
    band_text = fmt::format("the tolerance band {:.4g} to {:.4g}{} is", *t->lower, *t->upper, unit);
  else
    band_text = fmt::format("the limits (up to {:.4g}{} from zero) are", std::max(std::abs(band.lo), band.hi), unit);
  d.statement = fmt::format("Scale zoomed to the data: {} {} times wider than the span of the results with their "
                            "error bars; limits off scale are marked at the edge.",
                            band_text, ratio_text(d.ratio));
  return d;
}

Drawing chart_drawing(const ChartSpec& spec, const TextMeasure& measure) {
  validate(spec);
  DrawRecord unused;
  Drawing d;
  Renderer(measure, spec, unused, d).draw();
  return d;
}

void append_chart_svg(std::string& out, const ChartSpec& spec, const TextMeasure& measure) {
  validate(spec);
  DrawRecord rec;
  Drawing d;
  Renderer(measure, spec, rec, d).draw();
  append_svg(out, d, spec.title, description(spec), rec);
}

std::string chart_svg(const ChartSpec& spec) {
  std::string out;
  append_chart_svg(out, spec, drawing_backend().text_measure());
  return out;
}

std::string render_chart(const ChartSpec& spec, ChartFormat format) {
  switch (format) {
    case ChartFormat::svg:
      return "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n" + chart_svg(spec);
    case ChartFormat::pdf: {
      const auto& backend = drawing_backend();
      return backend.pdf(chart_drawing(spec, backend.text_measure()), spec.title);
    }
    case ChartFormat::png: {
      // Two pixels per point: sharp on screens and in print at the chart's natural size.
      const auto& backend = drawing_backend();
      return backend.png(chart_drawing(spec, backend.text_measure()), 2.0);
    }
  }
  return {};
}

ChartFormat chart_format_for(const std::filesystem::path& path) {
  std::string ext = path.extension().string();
  std::transform(ext.begin(), ext.end(), ext.begin(), [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  if (ext == ".svg") return ChartFormat::svg;
  if (ext == ".png") return ChartFormat::png;
  if (ext == ".pdf") return ChartFormat::pdf;
  throw InputError(fmt::format("chart file \"{}\" must end in .svg, .png or .pdf.", path.string()));
}

void write_chart(const ChartSpec& spec, const std::filesystem::path& path) {
  const std::string bytes = render_chart(spec, chart_format_for(path));
  store::write_whole_file(path, bytes, "chart file");
}

}  // namespace plumb::report
