// The SVG writer: real <text> for every label (read back with libxml2), escaping, a bounded size for a long
// history, no ids (charts sit inline side by side), and the line breaking that both back ends share.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <map>
#include <string>
#include <vector>

#include "report/chart/axis_ticks.hpp"
#include "report/chart/chart.hpp"
#include "report/chart/drawing.hpp"
#include "report/history/charts.hpp"
#include "stats/drift.hpp"
#include "support/history.hpp"
#include "support/svg_dom.hpp"
#include "support/xml_scan.hpp"

using namespace plumb::report;
using plumb::test::drawn;
using plumb::test::parse_svg;

namespace {

// Metrics worked by hand: every character is half the font size wide, a line 1.2 and the ascent 0.9 times it.
class HalfEmMeasure final : public TextMeasure {
 public:
  [[nodiscard]] double width(std::string_view line, const FontSpec& f) const override {
    double chars = 0;
    for (char c : line) chars += (static_cast<unsigned char>(c) & 0xC0U) != 0x80U;
    return chars * 0.5 * f.size;
  }
  [[nodiscard]] double line_height(const FontSpec& f) const override { return 1.2 * f.size; }
  [[nodiscard]] double ascent(const FontSpec& f) const override { return 0.9 * f.size; }
};

ChartSpec drift_like_spec() {
  ChartSpec s;
  s.title = "Balance B-07 (analytical, 220 g): Bias at 100 g, drift";
  s.subtitle = "2024-01-01 to 2024-02-05, 6 checks";
  s.x = {"Date of check", "", AxisScale::date};
  s.y = {"Bias at 100 g", "mg", AxisScale::number};
  ChartSeries series{"check result", {}};
  const double values[] = {0.05, 0.10, 0.08, 0.16, 0.19, 0.22};
  for (int i = 0; i < 6; ++i)
    series.points.push_back(
        {date_axis_value(plumb::add_days(plumb::parse_date("2024-01-01"), 7 * i)), values[i], 0.04});
  s.series.push_back(series);
  s.tolerance = ToleranceBand{-0.5, 0.5, "tolerance limit"};
  TrendLine t;
  t.x0 = series.points.front().x, t.y0 = 0.05;
  t.x1 = series.points.back().x, t.y1 = 0.22;
  t.x_extrapolated = t.x1 + 60, t.y_extrapolated = 0.46;
  t.label = "y = 0.00486 d + 0.05\nR\u00b2 = 0.95, RMSE = 0.015 mg";
  s.trend = t;
  s.notes.push_back(
      "Invented example data; a long note that the chart must wrap over more than one line because "
      "it is wider than the chart itself, as the caution under every history chart is, and this one goes on "
      "a little longer still so that no font could fit it on one line of the chart.");
  return s;
}

std::string one_line(std::string s) {
  std::replace(s.begin(), s.end(), '\n', ' ');
  return s;
}

}  // namespace

TEST_CASE("wrap_text breaks at spaces, inside a word only when it is wider than the line, and at new lines",
          "[report][chart][svg]") {
  const HalfEmMeasure m;
  const FontSpec two_pt{2};  // one point per character: widths are character counts
  using V = std::vector<std::string>;
  // "the quick" is 9 wide and fits in 10; adding " brown" makes 15.
  CHECK(wrap_text(m, "the quick brown fox", two_pt, 10) == V{"the quick", "brown fox"});
  CHECK(wrap_text(m, "abcdefghijkl", two_pt, 5) == V{"abcde", "fghij", "kl"});
  CHECK(wrap_text(m, "a\nb c", two_pt, 0) == V{"a", "b c"});
  // UTF-8: "±" is two bytes but one character; a cut never splits it.
  CHECK(wrap_text(m, "\u00b1\u00b1\u00b1\u00b1", two_pt, 3) == V{"\u00b1\u00b1\u00b1", "\u00b1"});
  CHECK(wrap_text(m, "fits", two_pt, -1) == V{"fits"});
}

TEST_CASE("chart SVG writes every label as real text, the same as its drawing record", "[report][chart][svg]") {
  const std::string svg = chart_svg(drift_like_spec());
  const auto nodes = parse_svg(svg);
  REQUIRE(nodes);
  const auto texts = drawn(*nodes, "text");
  REQUIRE(texts.size() >= 12);
  // Every text the renderer noted is drawn as a <text> of that role with those words (wrapped lines are tspans).
  std::size_t noted = 0;
  const auto md = svg.find("<metadata>");
  for (const auto& e : plumb::test::xml_elements(svg.substr(md, svg.find("</metadata>") - md), "text")) {
    ++noted;
    INFO(e.attr("role") << ": " << e.text);
    const bool found = std::any_of(texts.begin(), texts.end(), [&](const auto& t) {
      return t.attr("class") == e.attr("role") && t.text == one_line(e.text);
    });
    CHECK(found);
  }
  CHECK(noted == texts.size());
  const auto has = [&](const std::string& cls, const std::string& text) {
    return std::any_of(texts.begin(), texts.end(),
                       [&](const auto& t) { return t.attr("class") == cls && t.text == text; });
  };
  CHECK(has("title", "Balance B-07 (analytical, 220 g): Bias at 100 g, drift"));
  CHECK(has("x-axis-label", "Date of check"));
  CHECK(has("y-axis-label", "Bias at 100 g (mg)"));
  CHECK(has("legend", "trend (least squares)"));
  CHECK(has("legend", "trend, extrapolated"));
  CHECK(has("extrapolated-label", "extrapolated"));
  CHECK(has("trend-label", "y = 0.00486 d + 0.05 R\u00b2 = 0.95, RMSE = 0.015 mg"));
  // The long note is wrapped: more than one tspan.
  const auto note = std::find_if(texts.begin(), texts.end(), [](const auto& t) { return t.attr("class") == "note"; });
  REQUIRE(note != texts.end());
  CHECK(plumb::test::count_of(svg.substr(svg.find("<text class=\"note\"")), "<tspan") >= 2);
  // No glyph outlines, no images: text is text.
  CHECK(drawn(*nodes, "symbol").empty());
  CHECK(drawn(*nodes, "use").empty());
  CHECK(drawn(*nodes, "image").empty());
  CHECK(svg.rfind("<svg", 0) == 0);  // no XML declaration: the same text goes inline into a page
}

TEST_CASE("chart SVG places text where the measure says: y ticks end 6 pt left of the plot", "[report][chart][svg]") {
  const HalfEmMeasure m;
  std::string svg;
  append_chart_svg(svg, drift_like_spec(), m);
  const auto nodes = parse_svg(svg);
  REQUIRE(nodes);
  const auto plot = plumb::test::xml_elements(svg, "plot").at(0);
  const double left = std::stod(plot.attr("left"));
  std::size_t ticks = 0;
  for (auto p = svg.find("<text class=\"y-tick\""); p != std::string::npos;
       p = svg.find("<text class=\"y-tick\"", p + 1)) {
    const auto x0 = svg.find("<tspan x=\"", p) + 10;
    const double x = std::stod(svg.substr(x0, svg.find('"', x0) - x0));
    const auto t0 = svg.find('>', x0) + 1;
    const std::string label = svg.substr(t0, svg.find('<', t0) - t0);
    INFO(label);
    // The tick's right end (x + half a 9 pt em per character) is the plot's left minus 6 pt. Positions are written
    // to 0.01 pt; the margin allows that rounding twice.
    CHECK_THAT(x + 0.5 * 9 * static_cast<double>(label.size()), Catch::WithinAbs(left - 6, 0.02));
    ++ticks;
  }
  CHECK(ticks >= 3);
}

TEST_CASE("chart SVG escapes every text: an id with < & \" and ' comes out as written", "[report][chart][svg]") {
  ChartSpec s = drift_like_spec();
  const std::string nasty = "Balance <B&\"7'> </text><script>alert(1)</script>";
  s.title = nasty + ": bias";
  s.series.at(0).name = "check & <result>";
  s.notes = {"a note with ]]> and &amp; written literally"};
  const std::string svg = chart_svg(s);
  const auto nodes = parse_svg(svg);
  REQUIRE(nodes);  // well-formed: libxml2 parses it
  const auto texts = drawn(*nodes, "text");
  const auto is = [&](const std::string& cls, const std::string& text) {
    return std::any_of(texts.begin(), texts.end(),
                       [&](const auto& t) { return t.attr("class") == cls && t.text == text; });
  };
  CHECK(is("title", nasty + ": bias"));
  CHECK(is("legend", "check & <result>"));
  CHECK(is("note", "a note with ]]> and &amp; written literally"));
  CHECK(svg.find("<script") == std::string::npos);
  CHECK(svg.find("<B&") == std::string::npos);
  CHECK_THAT(svg, Catch::Contains("Balance &lt;B&amp;&quot;7'&gt;"));
  CHECK(drawn(*nodes, "script").empty());
}

TEST_CASE("a 400-run drift chart's SVG stays under 100 KB and defines no ids", "[report][chart][svg]") {
  using namespace plumb::stats;
  // 400 weekly results drifting 0.001 mg a week with a fixed, repeating scatter of up to 0.01 mg (invented).
  std::vector<Observation> h;
  plumb::Date d = plumb::parse_date("2018-01-01");
  for (int i = 0; i < 400; ++i) {
    h.push_back({d, 0.001 * i + 0.002 * ((i * 37) % 11 - 5), 0.05});
    d = plumb::add_days(d, 7);
  }
  DriftOptions o;
  o.tolerance = {-2.0, 2.0};
  const auto spec = drift_chart_spec(h, analyse_drift(h, o), o.tolerance, {"Balance B-07", "Bias at 100 g", "mg"});
  REQUIRE(spec.trend);  // a significant drift: trend, band and their legend are drawn too
  const std::string svg = chart_svg(spec);
  INFO(svg.size() << " bytes");
  CHECK(svg.size() < 100 * 1024);
  const auto nodes = parse_svg(svg);
  REQUIRE(nodes);
  // Every result drawn: 400 dots in the series colour and the legend's.
  CHECK(drawn(*nodes, "circle", {{"fill", "#0072b2"}}).size() == 401);
  for (const auto& n : *nodes) CHECK(n.attr("id").empty());
}
