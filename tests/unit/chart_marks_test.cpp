// What the charts mark beyond the values (issue 14, point 5), read back from the SVG's draw record
// (report/chart/draw_record.hpp): non-negative axes, the calibration chart's load axis and MPE steps with as found
// and as left, failed and void markers in plot and legend, the control chart's baseline, adjustments and a drift
// fitted within one adjustment period. Every expected value is worked by hand from the inputs written here.
#include <catch2/catch.hpp>

#include <fmt/format.h>
#include <map>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "app/history/trends.hpp"
#include "report/calibration/error_chart.hpp"
#include "report/chart/axis_ticks.hpp"
#include "report/chart/chart.hpp"
#include "report/history/charts.hpp"
#include "support/history.hpp"
#include "support/margin.hpp"
#include "support/svg_dom.hpp"
#include "support/xml_scan.hpp"

using namespace plumb::report;
using plumb::parse_date;
using plumb::test::milligrams_near;
using plumb::test::ug;
using plumb::test::xml_elements;

namespace {

std::vector<std::string> marks_texts(const std::string& svg, const std::string& role) {
  std::vector<std::string> out;
  for (const auto& e : xml_elements(svg, "text"))
    if (e.attr("role") == role) out.push_back(e.text);
  return out;
}

bool has_text(const std::vector<std::string>& texts, const std::string& wanted) {
  for (const auto& t : texts)
    if (t == wanted) return true;
  return false;
}

// The first series' colour as the SVG writer writes a filled dot (Okabe-Ito blue #0072B2).
const std::map<std::string, std::string> blue_fill{{"fill", "#0072b2"}};

// A calibration certificate's content, written by hand: a 220 g balance of class I with e = 1 mg, as found and
// as left at 50 g, 100 g and 200 g.
nlohmann::json calibration_content(const std::string& tolerance) {
  using nlohmann::json;
  const auto rows = [](double e50, double e100, double e200) {
    return json::array({{{"reference_g", 50.0}, {"error_g", e50}, {"U_g", 0.0003}, {"tolerance_g", 0.001}},
                        {{"reference_g", 100.0}, {"error_g", e100}, {"U_g", 0.0003}, {"tolerance_g", 0.002}},
                        {{"reference_g", 200.0}, {"error_g", e200}, {"U_g", 0.0004}, {"tolerance_g", 0.002}}});
  };
  json fit = {{"model", "line"}, {"coef", {0.0, 1.0}}, {"x_min_g", 50.0}, {"x_max_g", 200.0}};
  return {{"instrument", {{"id", "B-07"}}},
          {"check", {{"run_id", 12}, {"date", "2026-11-02"}}},
          {"calibration",
           {{"settings", {{"tolerance", tolerance}, {"accuracy_class", "I"}, {"e_g", "0.001"}}},
            {"capacity_g", "220"},
            {"readability_g", "0.0001"},
            {"final_stage", "as-left"},
            {"stages",
             {{{"stage", "as-found"},
               {"title", "As found"},
               {"error_of_indication", rows(0.0008, 0.0025, 0.0031)},
               {"fit", fit}},
              {{"stage", "as-left"},
               {"title", "As left (after adjustment)"},
               {"error_of_indication", rows(0.0001, -0.0002, 0.0003)},
               {"fit", fit}}}}}}};
}

}  // namespace

TEST_CASE("an SD, CV or minimum weight never gets a negative axis", "[report][chart][chart-marks]") {
  // Hand-built SDs near zero whose error bars reach below it: 0.05 - 0.08 = -0.03 mg.
  const auto h = plumb::test::weekly({0.05, 0.06, 0.04, 0.05}, 0.08);
  const plumb::stats::ToleranceLimits tol{std::nullopt, 0.3};
  HistoryChartLabels l{"Balance B-07", "Repeatability SD at 100 g", "mg", true};
  const std::string svg = render_chart(history_chart_spec(h, {}, tol, l), ChartFormat::svg);
  CHECK(xml_elements(svg, "plot").at(0).attr("y-min") == "0");
  // The same data as a quantity that may be negative (a bias) do get the axis below zero: the flag decides.
  l.non_negative = false;
  const std::string signed_svg = render_chart(history_chart_spec(h, {}, tol, l), ChartFormat::svg);
  CHECK(std::stod(xml_elements(signed_svg, "plot").at(0).attr("y-min")) < 0);
}

TEST_CASE("calibration chart: load axis 0 to capacity, as found and as left, MPE as R 76 steps",
          "[report][chart][chart-marks]") {
  const std::string svg = render_chart(calibration_error_chart(calibration_content("r76")), ChartFormat::svg);
  const auto plot = xml_elements(svg, "plot").at(0);
  CHECK(plot.attr("x-min") == "0");
  CHECK(plot.attr("x-max") == "220");  // the capacity, not the next tick

  std::size_t found = 0, left = 0;
  for (const auto& p : xml_elements(svg, "point")) {
    found += p.attr("series") == "E at each load, as found";
    left += p.attr("series") == "E at each load, as left (after adjustment)";
  }
  CHECK(found == 3);
  CHECK(left == 3);
  const auto legend = marks_texts(svg, "legend");
  CHECK(has_text(legend, "E at each load, as found"));
  CHECK(has_text(legend, "E at each load, as left (after adjustment)"));
  CHECK(has_text(legend, "\u00b1MPE in service (OIML R 76-1 Table 6)"));

  // OIML R 76-1:2006 Table 6, class I, e = 1 mg: 0.5 e up to 50000 e, 1 e up to 200000 e, 1.5 e above; in service
  // twice that (R 76-1 3.5.2): +-1 mg to 50 g, +-2 mg to 200 g, +-3 mg to 220 g, jumping at 50 g and 200 g.
  std::size_t steps = 0;
  for (const auto& c : xml_elements(svg, "curve")) steps += c.attr("style") == "step-limit";
  CHECK(steps == 2);
  std::vector<std::pair<double, double>> upper;
  for (const auto& v : xml_elements(svg, "curve-vertex"))
    if (upper.size() < 6) upper.emplace_back(std::stod(v.attr("x")), std::stod(v.attr("y")));
  const std::vector<std::pair<double, double>> hand = {{0, 1}, {50, 1}, {50, 2}, {200, 2}, {200, 3}, {220, 3}};
  REQUIRE(upper.size() == hand.size());
  for (std::size_t i = 0; i < hand.size(); ++i) {
    CHECK(upper[i].first == hand[i].first);  // band ends are whole grams, written exactly
    CHECK_THAT(upper[i].second, milligrams_near(hand[i].second, ug(0.001)));
  }
}

TEST_CASE("calibration chart against a non-R 76 tolerance marks the MPE at the tested loads only",
          "[report][chart][chart-marks]") {
  const std::string svg = render_chart(calibration_error_chart(calibration_content("usp41")), ChartFormat::svg);
  std::size_t marked = 0, steps = 0;
  for (const auto& c : xml_elements(svg, "curve")) {
    marked += c.attr("style") == "limit";
    steps += c.attr("style") == "step-limit";
  }
  CHECK(marked == 2);
  CHECK(steps == 0);
  CHECK(xml_elements(svg, "plot").at(0).attr("x-max") == "220");
}

TEST_CASE("failed and void runs get their own marker shape and legend entry", "[report][chart][chart-marks]") {
  const auto h = plumb::test::weekly({0.10, 0.90, 0.12, 0.11}, 0.05);
  HistoryChartMarks m;
  m.outcomes = {ChartPoint::Outcome::pass, ChartPoint::Outcome::failed, ChartPoint::Outcome::pass,
                ChartPoint::Outcome::pass};
  m.void_runs = plumb::test::weekly({0.50}, 0.0, "2024-01-04");
  const std::string svg = render_chart(
      history_chart_spec(h, {}, {-0.5, 0.5}, {"Balance B-07", "Bias at 100 g", "mg"}, m), ChartFormat::svg);
  std::size_t failed = 0, voided = 0, passed = 0;
  for (const auto& p : xml_elements(svg, "point")) {
    failed += p.attr("outcome") == "failed";
    voided += p.attr("outcome") == "void";
    passed += p.attr("outcome") == "pass";
  }
  CHECK(failed == 1);
  CHECK(voided == 1);
  CHECK(passed == 3);
  // The drawn geometry: only the 3 passes and the legend's dot are filled dots in the series colour; the failed
  // run is a stroked cross, not a dot of another colour.
  const auto nodes = plumb::test::parse_svg(svg);
  REQUIRE(nodes);
  CHECK(plumb::test::drawn(*nodes, "circle", blue_fill).size() == 4);
  const auto legend = marks_texts(svg, "legend");
  CHECK(has_text(legend, "check result: failed run"));
  CHECK(has_text(legend, "void run (entered in error)"));
}

TEST_CASE("the control chart shades and labels its baseline", "[report][chart][chart-marks]") {
  using namespace plumb::stats;
  const auto h = plumb::test::weekly({0.564, -0.564, 0.564, -0.564, 0.2, 0.1});
  const auto c = individuals_chart(h, {Baseline{0, 4}, "mg"});
  const std::string svg =
      render_chart(control_chart_spec(h, c, {}, {"Balance B-07", "Bias at 100 g", "mg"}), ChartFormat::svg);
  const auto b = xml_elements(svg, "baseline");
  REQUIRE(b.size() == 1);
  CHECK(b[0].attr("from") == fmt::format("{:.6g}", date_axis_value(parse_date("2024-01-01"))));
  CHECK(b[0].attr("to") == fmt::format("{:.6g}", date_axis_value(parse_date("2024-01-22"))));
  CHECK(marks_texts(svg, "baseline-label").at(0) == "baseline: 4 result(s), 2024-01-01 to 2024-01-22");
  const auto points = xml_elements(svg, "point");
  REQUIRE(points.size() == 6);
  const double from = std::stod(b[0].attr("px-from")), to = std::stod(b[0].attr("px-to"));
  // A point's position: the linear map of the x axis given by the plot entry.
  const auto plot = xml_elements(svg, "plot").at(0);
  const auto px = [&](const plumb::test::XmlElement& p) {
    const double left = std::stod(plot.attr("left")), right = std::stod(plot.attr("right"));
    const double x_min = std::stod(plot.attr("x-min")), x_max = std::stod(plot.attr("x-max"));
    return left + (std::stod(p.attr("x")) - x_min) / (x_max - x_min) * (right - left);
  };
  CHECK(px(points[0]) > from);
  CHECK(px(points[3]) < to);
  CHECK(px(points[4]) > to);  // the fifth result is judged, not part of the baseline
  CHECK(has_text(marks_texts(svg, "legend"), "baseline period (sets centre line and control limits)"));
}

TEST_CASE("an adjustment is marked and the drift is fitted after it only", "[report][chart][chart-marks][app]") {
  // Three checks, an adjusting calibration (run 4) on 2024-01-22, then four checks on a line rising 0.07 mg a week.
  SeriesView s;
  s.instrument_id = "B-07";
  s.quantity.key = "bias";
  s.quantity.label = "Bias at 100 g";
  s.quantity.unit = "mg";
  s.quantity.tolerance = {-1.0, 1.0};
  s.points = plumb::test::weekly({0.50, 0.55, 0.60}, 0.02);
  for (const auto& o : plumb::test::weekly({0.00, 0.07, 0.14, 0.21}, 0.02, "2024-01-29")) s.points.push_back(o);
  s.run_ids = {1, 2, 3, 5, 6, 7, 8};
  HistoryView all;
  all.columns.push_back(s.quantity);
  for (std::size_t i = 0; i < s.points.size(); ++i) {
    HistoryRow r;
    r.run_id = s.run_ids[i];
    r.date = s.points[i].date;
    r.verdict = "pass";
    r.values = {s.points[i].value};
    all.rows.push_back(r);
  }
  HistoryRow cal;
  cal.run_id = 4;
  cal.date = parse_date("2024-01-22");
  cal.procedure = plumb::checks::Procedure::calibration;
  cal.verdict = "pass";
  cal.values = {std::nullopt};
  cal.results = std::make_shared<const nlohmann::json>(nlohmann::json{{"adjusted", true}});
  all.rows.insert(all.rows.begin() + 3, cal);

  const HistoryChartMarks m = plumb::app::chart_marks(s, all);
  REQUIRE(m.fitted_from);
  CHECK(*m.fitted_from == 3);
  REQUIRE(m.adjustments.size() == 1);
  CHECK(m.adjustments[0].second == "adjusted (run 4)");

  const DriftView v{s, plumb::app::drift_in_period(s, m)};
  REQUIRE(v.drift.fit);
  CHECK(v.drift.origin == parse_date("2024-01-29"));
  // Hand: 0.07 mg in 7 days is 0.01 mg per day, from 0.00 at the first check after the adjustment to 0.21 on
  // day 21; the three results before it (0.50 to 0.60 mg) would pull a single line far off.
  CHECK_THAT(v.drift.slope_per_day, milligrams_near(0.01, ug(0.001)));
  CHECK_THAT(v.drift.fit->predict(21), milligrams_near(0.21, ug(0.001)));

  const std::string svg = render_chart(plumb::app::drift_chart_spec(v, m), ChartFormat::svg);
  const auto adj = xml_elements(svg, "adjustment");
  REQUIRE(adj.size() == 1);
  CHECK(adj[0].attr("x") == fmt::format("{:.6g}", date_axis_value(parse_date("2024-01-22"))));
  CHECK(marks_texts(svg, "adjustment-label").at(0) == "adjusted (run 4)");
  CHECK(has_text(marks_texts(svg, "legend"), "adjustment (as found / as left)"));
  bool said = false;
  for (const auto& n : marks_texts(svg, "note"))
    said = said || n.find("fitted to the 4 result(s) from 2024-01-29 on only, after the latest adjustment") !=
                       std::string::npos;
  CHECK(said);
}
