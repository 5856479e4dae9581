// Charts: the SVG is parsed for what the renderer drew, the PDF's real text is extracted with poppler's
// pdftotext, and the PNG's header is read.
//
// How the SVG is made testable: the renderer notes each element as it draws it and the SVG carries that record
// in <title>, <desc> and <metadata> (report/chart/draw_record.hpp). These tests read that record, and cross-check
// it against the drawn geometry, read with libxml2, where that can be counted (each point is one circle in the
// series colour; each error bar one path stroked in that colour at 85 % opacity). The drawn text is checked as
// the SVG's real <text> (chart_svg_test.cpp) and in the PDF with pdftotext.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <map>

#include "core/errors.hpp"
#include "report/chart/axis_ticks.hpp"
#include "report/chart/chart.hpp"
#include "report/history/charts.hpp"
#include "support/history.hpp"
#include "support/margin.hpp"
#include "support/svg_dom.hpp"
#include "support/xml_scan.hpp"

using namespace plumb::report;
using plumb::parse_date;
using plumb::test::microlitres_near;
using plumb::test::milligrams_near;
using plumb::test::ug;
using plumb::test::ul;
using plumb::test::xml_elements;

namespace {

// The first series' colour (Okabe-Ito blue #0072B2, 0.000 0.447 0.698 rounded to bytes) as the SVG writer
// writes it; error bars in it at 85 % opacity.
const std::map<std::string, std::string> point_fill{{"fill", "#0072b2"}};
const std::map<std::string, std::string> error_bar_stroke{{"stroke", "#0072b2"}, {"stroke-opacity", "0.85"}};

ChartSpec sample_spec() {
  ChartSpec s;
  s.title = "Balance B-07 (analytical, 220 g): Bias at 100 g, drift";
  s.subtitle = "2024-01-01 to 2024-02-05, 6 checks";
  s.x = {"Date of check", "", AxisScale::date};
  s.y = {"Bias at 100 g", "mg", AxisScale::number};
  ChartSeries series{"check result", {}};
  const double values[] = {0.05, 0.10, 0.08, 0.16, 0.19, 0.22};
  for (int i = 0; i < 6; ++i) {
    ChartPoint p{date_axis_value(plumb::add_days(parse_date("2024-01-01"), 7 * i)), values[i], 0.04, false};
    if (i == 2) p.error.reset();  // one check without a stated U: no error bar
    series.points.push_back(p);
  }
  s.series.push_back(series);
  s.tolerance = ToleranceBand{-0.5, 0.5, "tolerance limit"};
  TrendLine t;
  t.x0 = series.points.front().x, t.y0 = 0.05;
  t.x1 = series.points.back().x, t.y1 = 0.22;
  t.x_extrapolated = t.x1 + 60, t.y_extrapolated = 0.46;
  t.label = "y = 0.00486 d + 0.05\nR\u00b2 = 0.95, RMSE = 0.015 mg";
  s.trend = t;
  s.notes.push_back("Invented example data.");
  return s;
}

std::vector<plumb::test::XmlElement> texts_with_role(const std::string& svg, const std::string& role) {
  std::vector<plumb::test::XmlElement> out;
  for (auto& e : xml_elements(svg, "text"))
    if (e.attr("role") == role) out.push_back(e);
  return out;
}

std::string run_pdftotext(const std::filesystem::path& pdf) {
  const std::string cmd = "pdftotext -layout '" + pdf.string() + "' - 2>/dev/null";
  std::string out;
  if (FILE* p = popen(cmd.c_str(), "r")) {
    char buf[4096];
    std::size_t n;
    while ((n = fread(buf, 1, sizeof buf, p)) > 0) out.append(buf, n);
    pclose(p);
  }
  return out;
}

bool have_pdftotext() { return std::system("pdftotext -v >/dev/null 2>&1") == 0; }

}  // namespace

TEST_CASE("chart SVG names title, axes with units, points, error bars, tolerance and trend", "[report][chart]") {
  const auto spec = sample_spec();
  const std::string svg = render_chart(spec, ChartFormat::svg);

  const auto title = xml_elements(svg, "title");
  REQUIRE(title.size() == 1);
  CHECK(title[0].text == spec.title);
  REQUIRE(texts_with_role(svg, "title").size() == 1);
  CHECK(texts_with_role(svg, "x-axis-label").at(0).text == "Date of check");
  CHECK(texts_with_role(svg, "y-axis-label").at(0).text == "Bias at 100 g (mg)");
  CHECK(texts_with_role(svg, "subtitle").at(0).text == "2024-01-01 to 2024-02-05, 6 checks");

  const auto points = xml_elements(svg, "point");
  CHECK(points.size() == 6);
  CHECK(xml_elements(svg, "error-bar").size() == 5);
  // The drawn geometry: 6 point dots + 1 legend dot in the series colour; 5 error-bar strokes.
  const auto nodes = plumb::test::parse_svg(svg);
  REQUIRE(nodes);
  CHECK(plumb::test::drawn(*nodes, "circle", point_fill).size() == 7);
  CHECK(plumb::test::drawn(*nodes, "path", error_bar_stroke).size() == 5);

  const auto plot = xml_elements(svg, "plot").at(0);
  const double left = std::stod(plot.attr("left")), right = std::stod(plot.attr("right"));
  const double top = std::stod(plot.attr("top")), bottom = std::stod(plot.attr("bottom"));
  const double x_min = std::stod(plot.attr("x-min")), x_max = std::stod(plot.attr("x-max"));
  const double y_min = std::stod(plot.attr("y-min")), y_max = std::stod(plot.attr("y-max"));
  for (const auto& p : points) {  // every point visible inside the plot frame (the linear map of the axes)
    const double px = left + (std::stod(p.attr("x")) - x_min) / (x_max - x_min) * (right - left);
    const double py = bottom - (std::stod(p.attr("y")) - y_min) / (y_max - y_min) * (bottom - top);
    CHECK(px > left);
    CHECK(px < right);
    CHECK(py > top);
    CHECK(py < bottom);
  }

  const auto limits = xml_elements(svg, "tolerance-limit");
  REQUIRE(limits.size() == 2);
  CHECK(limits[0].attr("side") == "lower");
  CHECK(limits[0].attr("value") == "-0.5");
  CHECK(limits[1].attr("value") == "0.5");
  for (const auto& l : limits) {
    CHECK(std::stod(l.attr("py")) >= top);
    CHECK(std::stod(l.attr("py")) <= bottom);
  }
  CHECK(xml_elements(svg, "zero-line").size() == 1);

  CHECK(texts_with_role(svg, "trend-label").at(0).text == spec.trend->label);
  CHECK(xml_elements(svg, "trend").size() == 1);
  CHECK(xml_elements(svg, "extrapolated").at(0).attr("dashed") == "true");
  CHECK(texts_with_role(svg, "extrapolated-label").at(0).text == "extrapolated");
  CHECK(texts_with_role(svg, "note").at(0).text == "Invented example data.");
}

TEST_CASE("chart scaling keeps the tolerance band, zero line and every point in view", "[report][chart]") {
  SECTION("points between 0.1 and 0.2 with limits +/-1: the axis spans the limits") {
    ChartSpec s = sample_spec();
    s.trend.reset();
    s.tolerance = ToleranceBand{-1.0, 1.0, "tolerance limit"};
    const auto plot = xml_elements(render_chart(s, ChartFormat::svg), "plot").at(0);
    CHECK(std::stod(plot.attr("y-min")) <= -1.0);
    CHECK(std::stod(plot.attr("y-max")) >= 1.0);
  }
  SECTION("a point far outside the tolerance (3.0 mg, U 0.04) is not cut off, nor is zero") {
    ChartSpec s = sample_spec();
    s.trend.reset();
    s.series[0].points[5].y = 3.0;
    for (auto& p : s.series[0].points) p.y += 2.0;  // all results well above zero now
    const auto plot = xml_elements(render_chart(s, ChartFormat::svg), "plot").at(0);
    CHECK(std::stod(plot.attr("y-max")) >= 5.04);
    CHECK(std::stod(plot.attr("y-min")) <= -0.5);  // the lower limit, and with it zero, stays in view
  }
  SECTION("y tick labels step in the 1-2-5 series") {
    const auto ticks = texts_with_role(render_chart(sample_spec(), ChartFormat::svg), "y-tick");
    REQUIRE(ticks.size() >= 3);
    const double step = std::stod(ticks[1].attr("value")) - std::stod(ticks[0].attr("value"));
    const double mantissa = step / std::pow(10.0, std::floor(std::log10(step)));
    CHECK((std::abs(mantissa - 1) < 1e-9 || std::abs(mantissa - 2) < 1e-9 || std::abs(mantissa - 5) < 1e-9));
  }
}

TEST_CASE("chart zooms to the data when the tolerance band is over 20 times wider, and says so", "[report][chart][zoom]") {
  // Worked by hand: results 0.2 and 0.3 mg with U = 0.1 mg span 0.1 to 0.4 mg; with zero in view the data span
  // 0 to 0.4 = 0.4 mg. The band -100 to +100 mg is 200 mg wide: 200 / 0.4 = 500 times the data, above 20.
  ChartSpec s = sample_spec();
  s.trend.reset();
  s.series[0].points.resize(2);
  s.series[0].points[0].y = 0.2, s.series[0].points[0].error = 0.1;
  s.series[0].points[1].y = 0.3, s.series[0].points[1].error = 0.1;
  s.tolerance = ToleranceBand{-100.0, 100.0, "tolerance limit"};
  REQUIRE(scale_decision(s).zoomed);
  CHECK(scale_decision(s).ratio == Approx(500.0).epsilon(1e-12));

  SECTION("zoomed: the axis fits the data, both limits are off-scale markers, the subtitle states the zoom") {
    const std::string svg = render_chart(s, ChartFormat::svg);
    const auto plot = xml_elements(svg, "plot").at(0);
    CHECK(std::stod(plot.attr("y-min")) <= 0.0);  // zero stays in view
    CHECK(std::stod(plot.attr("y-max")) >= 0.4);  // every error bar too
    CHECK(std::stod(plot.attr("y-max")) < 1.0);   // and the scale is the data's, not the band's
    const auto markers = xml_elements(svg, "off-scale-limit");
    REQUIRE(markers.size() == 2);
    CHECK(markers[0].attr("edge") == "bottom");
    CHECK_THAT(std::stod(markers[0].attr("value")), milligrams_near(-100.0, ug(0.001)));
    CHECK(markers[1].attr("edge") == "top");
    CHECK_THAT(std::stod(markers[1].attr("value")), milligrams_near(100.0, ug(0.001)));
    CHECK(xml_elements(svg, "tolerance-limit").empty());
    const auto labels = texts_with_role(svg, "off-scale-label");
    REQUIRE(labels.size() == 2);
    CHECK_THAT(labels[1].text, Catch::Contains("upper limit +100 mg, off scale"));
    CHECK_THAT(labels[0].text, Catch::Contains("lower limit -100 mg, off scale"));
    const auto zoom = texts_with_role(svg, "zoom-statement");
    REQUIRE(zoom.size() == 1);
    CHECK_THAT(zoom[0].text, Catch::Contains("Scale zoomed to the data") && Catch::Contains("100 mg") &&
                                 Catch::Contains("500 times wider"));
  }
  SECTION("--full-scale: the whole band in view, no markers, no zoom statement") {
    s.full_scale = true;
    CHECK_FALSE(scale_decision(s).zoomed);
    const std::string svg = render_chart(s, ChartFormat::svg);
    const auto plot = xml_elements(svg, "plot").at(0);
    CHECK(std::stod(plot.attr("y-min")) <= -100.0);
    CHECK(std::stod(plot.attr("y-max")) >= 100.0);
    CHECK(xml_elements(svg, "off-scale-limit").empty());
    CHECK(xml_elements(svg, "tolerance-limit").size() == 2);
    CHECK(texts_with_role(svg, "zoom-statement").empty());
  }
  SECTION("a band 10 times the data is drawn in full (the rule zooms above 20 times only)") {
    s.tolerance = ToleranceBand{-2.0, 2.0, "tolerance limit"};  // 4 / 0.4 = 10
    CHECK_FALSE(scale_decision(s).zoomed);
    CHECK(xml_elements(render_chart(s, ChartFormat::svg), "off-scale-limit").empty());
  }
}

TEST_CASE("chart PDF holds the title and axis labels as real text (pdftotext)", "[report][chart][pdf]") {
  if (!have_pdftotext()) {
    WARN("skipped: pdftotext (poppler-utils) is not installed, so the PDF text cannot be extracted");
    return;
  }
  const auto spec = sample_spec();
  const auto path = std::filesystem::temp_directory_path() / "plumb_chart_test.pdf";
  write_chart(spec, path);
  const std::string text = run_pdftotext(path);
  std::filesystem::remove(path);
  CHECK_THAT(text, Catch::Contains("Balance B-07 (analytical, 220 g): Bias at 100 g, drift"));
  CHECK_THAT(text, Catch::Contains("Date of check"));
  CHECK_THAT(text, Catch::Contains("Bias at 100 g (mg)"));
  CHECK_THAT(text, Catch::Contains("y = 0.00486 d + 0.05"));
  CHECK_THAT(text, Catch::Contains("extrapolated"));
  CHECK_THAT(text, Catch::Contains("2024-01"));  // a date tick label
}

TEST_CASE("chart PNG is drawn at two pixels per point", "[report][chart][png]") {
  const std::string png = render_chart(sample_spec(), ChartFormat::png);
  REQUIRE(png.size() > 24);
  CHECK(png.substr(1, 3) == "PNG");
  // IHDR: width and height as big-endian 32-bit integers at bytes 16 and 20; 840 x 520 points -> 1680 x 1040.
  const auto be32 = [&](std::size_t at) {
    return (static_cast<unsigned char>(png[at]) << 24) | (static_cast<unsigned char>(png[at + 1]) << 16) |
           (static_cast<unsigned char>(png[at + 2]) << 8) | static_cast<unsigned char>(png[at + 3]);
  };
  CHECK(be32(16) == 1680);
  CHECK(be32(20) == 1040);
}

TEST_CASE("chart bad input is one clear sentence", "[report][chart][errors]") {
  ChartSpec s = sample_spec();
  s.title.clear();
  CHECK_THROWS_WITH(render_chart(s, ChartFormat::svg), Catch::Contains("chart title is empty"));
  s = sample_spec();
  s.y.label.clear();
  CHECK_THROWS_AS(render_chart(s, ChartFormat::svg), plumb::InputError);
  s = sample_spec();
  s.series[0].points[1].y = std::nan("");
  CHECK_THROWS_WITH(render_chart(s, ChartFormat::svg), Catch::Contains("point 2 of series \"check result\" y"));
  CHECK_THROWS_WITH(chart_format_for("history.jpg"), Catch::Contains("history.jpg"));
  CHECK(chart_format_for("a/b/History.PDF") == ChartFormat::pdf);
}

TEST_CASE("axis ticks in 1-2-5 steps and calendar steps, worked by hand", "[report][chart][ticks]") {
  // Steps and tick values are unit-free numbers of the axis: to 1e-12 relative.
  CHECK(nice_step(0.13) == Approx(0.2).epsilon(1e-12));
  CHECK(nice_step(0.7) == Approx(1.0).epsilon(1e-12));
  CHECK(nice_step(3.0) == Approx(5.0).epsilon(1e-12));
  CHECK(nice_step(0.05) == Approx(0.05).epsilon(1e-12));
  CHECK(nice_step(120) == Approx(200).epsilon(1e-12));
  // -0.53 .. 0.61 in about 6 steps: raw 1.14 / 6 = 0.19 -> 0.2; -0.53 / 0.2 = -2.65 -> -3 -> -0.6;
  // 0.61 / 0.2 = 3.05 -> 4 -> 0.8. Labels -0.6, -0.4, -0.2, 0.0, 0.2, 0.4, 0.6, 0.8.
  const auto t = number_ticks(-0.53, 0.61, 6);
  CHECK(t.min == Approx(-0.6).epsilon(1e-12));
  CHECK(t.max == Approx(0.8).epsilon(1e-12));
  REQUIRE(t.ticks.size() == 8);
  CHECK(t.ticks[0].label == "-0.6");
  CHECK(t.ticks[3].label == "0.0");
  CHECK(t.ticks[7].label == "0.8");
  // 2024-01-08 .. 2024-06-25 with at most 7 ticks: weekly (26) and fortnightly (13) are too many; monthly
  // ticks on the 1st from 2024-01-01 to 2024-07-01 are 7.
  const auto d = date_ticks(date_axis_value(parse_date("2024-01-08")), date_axis_value(parse_date("2024-06-25")), 7);
  REQUIRE(d.ticks.size() == 7);
  CHECK(d.ticks.front().label == "2024-01");
  CHECK(d.ticks.back().label == "2024-07");
  CHECK(d.min == date_axis_value(parse_date("2024-01-01")));
}

TEST_CASE("history chart specs draw a trend line only where the slope is significant", "[report][chart]") {
  using namespace plumb::stats;
  const HistoryChartLabels labels{"Balance B-07 (analytical, 220 g)", "Bias at 100 g", "mg"};
  const ToleranceLimits tol{-2.0, 2.0};
  DriftOptions o;
  o.tolerance = tol;
  // The hand-worked drift example (drift_test.cpp): p between 0.05 and 0.10 -> no trend line.
  const auto weak = plumb::test::weekly({1.0, 1.2, 1.1, 1.5, 1.4}, 0.05, "2024-01-01", 10);
  const auto s1 = drift_chart_spec(weak, analyse_drift(weak, o), tol, labels);
  CHECK_FALSE(s1.trend);
  CHECK_THAT(s1.notes.at(0), Catch::Contains("No trend line is drawn"));
  CHECK(s1.title == "Balance B-07 (analytical, 220 g): Bias at 100 g, drift");
  CHECK(s1.subtitle == "2024-01-01 to 2024-02-10, 5 check(s)");
  CHECK(s1.series.at(0).points.at(0).error == 0.05);
  // The clear trend (p < 0.001): a trend line labelled with its equation, R^2 and RMSE.
  const auto clear = plumb::test::weekly({1.00, 1.10, 1.21, 1.30, 1.40}, 0.05, "2024-01-01", 10);
  const auto s2 = drift_chart_spec(clear, analyse_drift(clear, o), tol, labels);
  REQUIRE(s2.trend);
  CHECK_THAT(s2.trend->label, Catch::Contains("y = 0.01 d + 1.002") && Catch::Contains("R\u00b2 = ") &&
                                  Catch::Contains("RMSE = "));
  CHECK_THAT(s2.notes.back(), Catch::Contains("medicine, clinical or food"));
}

TEST_CASE("control chart spec rings the flagged points and lists the explanations", "[report][chart]") {
  using namespace plumb::stats;
  // Hand-built: baseline +/-0.564 (centre 0, sigma 1), then 3.5: rule 1 at 0-based 4 only.
  const auto h = plumb::test::weekly({0.564, -0.564, 0.564, -0.564, 3.5, 0.1});
  const auto c = individuals_chart(h, {Baseline{0, 4}, "mg"});
  const auto s = control_chart_spec(h, c, {}, {"Pipette P-12 (100 uL)", "Systematic error at 100 uL", "uL"});
  REQUIRE(s.control);
  CHECK_THAT(s.control->upper, microlitres_near(3.0, ul(1e-12)));
  CHECK(s.series[0].points[4].flagged);
  CHECK_FALSE(s.series[0].points[5].flagged);
  const std::string svg = render_chart(s, ChartFormat::svg);
  std::size_t ringed = 0;
  for (const auto& p : xml_elements(svg, "point")) ringed += p.attr("flagged") == "true";
  CHECK(ringed == 1);
  CHECK(xml_elements(svg, "control-lines").size() == 1);
}
