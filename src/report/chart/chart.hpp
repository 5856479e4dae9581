#pragma once
// A chart of an instrument's history, described by a plain ChartSpec (no database, no statistics):
// the caller fills it from a history query, a control chart or a drift analysis; chart_drawing lays it out
// once as a Drawing (drawing.hpp), which the SVG writer and the cairo back end write as SVG, PNG or PDF.
//
// What the spec asks for follows the chart rules of doc/charts.md: a descriptive title naming instrument,
// quantity and period; axis labels with units; grid lines with 1-2-5 tick steps; honest scaling (every
// point with its error bar, the tolerance band and the zero line are always in view); visible points;
// error bars for the expanded uncertainty; a legend; a trend line with its label; its extrapolated part
// dashed and labelled "extrapolated"; control lines; flagged points marked.
#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include "report/chart/drawing.hpp"

namespace plumb::report {

enum class AxisScale { number, date };

struct AxisSpec {
  std::string label;  ///< "Bias at 100 g"
  std::string unit;   ///< "mg"; shown as "label (unit)"; empty for dates
  AxisScale scale = AxisScale::number;
  [[nodiscard]] std::string text() const { return unit.empty() ? label : label + " (" + unit + ")"; }
};

/// x is a number, or for a date axis the days since 1970-01-01 (report::date_axis_value).
struct ChartPoint {
  double x = 0.0;
  double y = 0.0;
  std::optional<double> error;  ///< half-length of the error bar: the expanded uncertainty U
  bool flagged = false;         ///< e.g. a Western Electric signal: drawn with a ring
  /// A failed or void run is drawn with its own marker shape (a cross, an open square), not by colour alone,
  /// and the legend names each shape in use.
  enum class Outcome { pass, failed, void_run };
  Outcome outcome = Outcome::pass;
};

struct ChartSeries {
  std::string name;
  std::vector<ChartPoint> points;
};

struct ToleranceBand {
  std::optional<double> lower, upper;
  std::string label = "tolerance limit";
};

struct PredictionBandPoint {
  double x, lower, upper;
};

/// The fitted line from (x0, y0) to (x1, y1), solid; optionally continued, dashed and labelled
/// "extrapolated", to (x_extrapolated, y_extrapolated).
struct TrendLine {
  double x0 = 0, y0 = 0, x1 = 0, y1 = 0;
  std::optional<double> x_extrapolated, y_extrapolated;
  std::string label;  ///< equation, R^2, RMSE: shown beside the legend
  std::vector<PredictionBandPoint> prediction_band;  ///< shaded when given
  std::string band_label = "95 % prediction interval";
};

struct ControlLines {
  double centre = 0, lower = 0, upper = 0;
};

/// A named polyline in data coordinates: a fitted model across the loads, or a limit that changes along x
/// (an MPE that steps up with the load). Limits are drawn like the tolerance band; models like the trend.
struct ChartCurve {
  /// `limit`: known at the tested points only (bars joined by a dotted guide); `step_limit`: a limit stated for
  /// every x, drawn solid as steps (OIML R 76-1 MPE bands).
  enum class Style { model, limit, step_limit };
  std::string name;  ///< legend text
  Style style = Style::model;
  std::vector<std::pair<double, double>> points;
};

/// A stretch of x shaded behind the data and labelled: the baseline a control chart's limits were set from.
struct XSpan {
  double from = 0, to = 0;
  std::string label;  ///< "baseline: 20 results, 2024-01-01 to 2024-05-13"
};

/// A vertical line across the plot at x, labelled at its top: an adjustment of the instrument.
struct XMarker {
  double x = 0;
  std::string label;  ///< "adjusted (run 12)"
};

/// The tolerance band may be at most this many times the span of the data (with error bars and zero)
/// before the chart zooms to the data; above it, a full-scale chart would draw the results as a flat line.
constexpr double zoom_threshold = 20.0;

struct ChartSpec {
  std::string title;     ///< instrument, quantity
  std::string subtitle;  ///< period, e.g. "2024-01-01 to 2024-12-16, 50 checks"
  AxisSpec x, y;
  std::vector<ChartSeries> series;
  std::optional<ToleranceBand> tolerance;
  bool zero_line = true;
  std::optional<TrendLine> trend;
  std::optional<ControlLines> control;
  std::optional<XSpan> baseline;  ///< shaded and labelled behind the data
  std::vector<XMarker> markers;   ///< adjustments: dashed verticals with a label; said in the legend
  std::vector<ChartCurve> curves;
  /// A fixed x axis (e.g. 0 to the balance's capacity) instead of one fitted to the data.
  std::optional<std::pair<double, double>> x_range;
  /// For quantities that cannot be negative (SD, CV, minimum weight): the y axis starts at zero at the lowest.
  bool y_non_negative = false;
  bool full_scale = false;  ///< never zoom: the tolerance band in view however flat it makes the data
  std::vector<std::string> notes;  ///< small print under the chart (caution, method)
  double width = 840, height = 520;  ///< in points (1/72 in); PNG is drawn at 2 pixels per point
};

/// How the y axis was chosen: the zoom is decided from the spec alone, so callers and tests can ask.
struct ScaleDecision {
  bool zoomed = false;
  double ratio = 1.0;     ///< tolerance band width / span of the data, when zoomed
  std::string statement;  ///< "scale zoomed to the data; the tolerance band ±100 mg is 400 times wider ..."
};
ScaleDecision scale_decision(const ChartSpec& spec);

enum class ChartFormat { svg, png, pdf };

/// The file's bytes. Throws InputError for an empty title, a missing axis label, a non-finite value
/// or a size below 320 x 240.
std::string render_chart(const ChartSpec& spec, ChartFormat format);

/// The chart laid out as one Drawing, with text widths from `measure`: what every format writes. Throws
/// InputError like render_chart.
Drawing chart_drawing(const ChartSpec& spec, const TextMeasure& measure);

/// The chart as an SVG element with real <text> (no XML declaration): for a file, or inline in an HTML page
/// (the web application and the HTML report call this). Throws InputError like render_chart.
std::string chart_svg(const ChartSpec& spec);
/// The same, appended to `out`, with the given metrics (a test may give fixed ones).
void append_chart_svg(std::string& out, const ChartSpec& spec, const TextMeasure& measure);

/// Format from the extension (.svg, .png, .pdf); throws InputError naming the path otherwise.
ChartFormat chart_format_for(const std::filesystem::path& path);
/// Renders and writes; throws StorageError when the file cannot be written.
void write_chart(const ChartSpec& spec, const std::filesystem::path& path);

}  // namespace plumb::report
