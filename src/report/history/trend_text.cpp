#include "report/history/trend_text.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <sstream>

#include "report/format/csv.hpp"
#include "report/format/text.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

std::string text_number(std::optional<double> v) { return v ? fmt::format("{:.4g}", *v) : "-"; }
json num_json(std::optional<double> v) { return v ? json(*v) : json(); }
std::string date_text(std::optional<Date> d) { return d ? to_string(*d) : "-"; }
json date_json(std::optional<Date> d) { return d ? json(to_string(*d)) : json(); }
json id_json(std::optional<std::int64_t> id) { return id ? json(*id) : json(); }

void line(std::string& out, const std::string& s) { out += s + "\n"; }
void para(std::string& out, const std::string& s, const std::string& first = "  ", const std::string& rest = "    ") {
  for (const auto& l : wrap(s, 100, first, rest)) line(out, l);
}

std::string period_text(const std::vector<stats::Observation>& points) {
  if (points.empty()) return "no results";
  return fmt::format("{} result(s) from {} to {}", points.size(), to_string(points.front().date),
                     to_string(points.back().date));
}

std::string tolerance_text(const QuantityView& q) {
  const auto& t = q.tolerance;
  if (!t.lower && !t.upper) return "none (" + q.tolerance_basis + ")";
  return q.tolerance_basis;
}

json tolerance_json(const QuantityView& q) {
  return {{value_key("lower", q.unit), num_json(q.tolerance.lower)},
          {value_key("upper", q.unit), num_json(q.tolerance.upper)},
          {"basis", q.tolerance_basis}};
}

json quantity_json(const QuantityView& q) {
  return {{"key", q.key}, {"label", q.label}, {"unit", q.unit}, {"uncertainty_basis", q.uncertainty_basis},
          {"tolerance", tolerance_json(q)}};
}

json points_json(const SeriesView& s) {
  json a = json::array();
  for (std::size_t i = 0; i < s.points.size(); ++i)
    a.push_back({{"run_id", s.run_ids[i]},
                 {"date", to_string(s.points[i].date)},
                 {value_key(s.quantity.key, s.quantity.unit), s.points[i].value},
                 {value_key(s.quantity.key, s.quantity.unit, "u"), s.points[i].expanded_uncertainty}});
  return a;
}

std::string run_note(const HistoryRow& r) {
  std::string note;
  if (r.void_reason) note = "VOID: " + *r.void_reason;
  if (r.superseded_by) note = fmt::format("superseded by run {}", *r.superseded_by);
  if (r.supersedes) note += fmt::format("{}corrects run {}", note.empty() ? "" : "; ", *r.supersedes);
  return note;
}

}  // namespace

std::string value_key(const std::string& key, const std::string& unit, const std::string& infix) {
  std::string k = key;
  std::replace(k.begin(), k.end(), '-', '_');
  // JSON and CSV keys end in their unit (README, "Output"): _mg, _ul, _pct.
  const std::string u = unit == "%" ? "pct" : unit == "uL" ? "ul" : unit;
  return infix.empty() ? k + "_" + u : k + "_" + infix + "_" + u;
}

// ---- history --------------------------------------------------------------------------------------

std::string history_text(const HistoryView& v) {
  std::string out;
  line(out, fmt::format("History of {}: {} check run(s){}", v.instrument_title, v.rows.size(),
                        v.from || v.to ? fmt::format(" from {} to {}", date_text(v.from), date_text(v.to)) : ""));
  std::string head = fmt::format("{:>5}  {:<10}  {:<13}  {:<18}", "run", "date", "procedure", "operator");
  for (const auto& c : v.columns) head += fmt::format("  {:>16}  {:>8}", fmt::format("{} ({})", c.key, c.unit), "U");
  head += fmt::format("  {:<7}  {:<10}  {}", "verdict", "next due", "note");
  line(out, head);
  for (const auto& r : v.rows) {
    std::string l = fmt::format("{:>5}  {:<10}  {:<13}  {:<18}", r.run_id, to_string(r.date), checks::to_string(r.procedure),
                                r.operator_name.substr(0, 18));
    for (std::size_t i = 0; i < v.columns.size(); ++i)
      l += fmt::format("  {:>16}  {:>8}", text_number(r.values[i]), text_number(r.uncertainties[i]));
    l += fmt::format("  {:<7}  {:<10}  {}", r.current() ? r.verdict : r.verdict + "*", date_text(r.next_due),
                     run_note(r));
    line(out, l);
  }
  if (std::any_of(v.rows.begin(), v.rows.end(), [](const auto& r) { return !r.current(); }))
    line(out, "* superseded or void: kept as recorded; it does not count in trends and due dates (a correcting run "
              "replaces a superseded one).");
  line(out, "U: expanded uncertainty, k = 2.");
  for (const auto& c : v.columns) {
    para(out, fmt::format("{}: {}.", c.key, c.uncertainty_basis));
    para(out, fmt::format("{} tolerance: {}.", c.key, tolerance_text(c)), "    ", "      ");
  }
  return out;
}

std::string history_csv(const HistoryView& v) {
  std::ostringstream out;
  CsvWriter csv(out);
  for (const auto* name : {"run_id", "date", "procedure", "operator", "verdict", "next_due", "supersedes",
                           "superseded_by"})
    csv.value(name);
  for (const auto& c : v.columns) csv.value(value_key(c.key, c.unit)).value(value_key(c.key, c.unit, "u"));
  csv.end_row();
  const auto optional_id = [&](const std::optional<std::int64_t>& id) { id ? csv.integer(*id) : csv.empty(); };
  for (const auto& r : v.rows) {
    csv.integer(r.run_id).value(to_string(r.date)).value(checks::to_string(r.procedure)).text(r.operator_name);
    csv.value(r.verdict).value(r.next_due ? to_string(*r.next_due) : "");
    optional_id(r.supersedes);
    optional_id(r.superseded_by);
    for (std::size_t i = 0; i < v.columns.size(); ++i) {
      csv.value(r.values[i] ? fmt::format("{:.10g}", *r.values[i]) : "");
      csv.value(r.uncertainties[i] ? fmt::format("{:.6g}", *r.uncertainties[i]) : "");
    }
    csv.end_row();
  }
  return out.str();
}

json history_json(const HistoryView& v) {
  json columns = json::array(), runs = json::array();
  for (const auto& c : v.columns) columns.push_back(quantity_json(c));
  for (const auto& r : v.rows) {
    json values = json::object();
    for (std::size_t i = 0; i < v.columns.size(); ++i) {
      values[value_key(v.columns[i].key, v.columns[i].unit)] = num_json(r.values[i]);
      values[value_key(v.columns[i].key, v.columns[i].unit, "u")] = num_json(r.uncertainties[i]);
    }
    runs.push_back({{"run_id", r.run_id},
                    {"date", to_string(r.date)},
                    {"procedure", std::string(checks::to_string(r.procedure))},
                    {"operator", r.operator_name},
                    {"verdict", r.verdict},
                    {"next_due", date_json(r.next_due)},
                    {"supersedes", id_json(r.supersedes)},
                    {"superseded_by", id_json(r.superseded_by)},
                    {"values", values},
                    {"results", r.results ? *r.results : json()}});
  }
  return {{"instrument", v.instrument_id}, {"title", v.instrument_title}, {"from", date_json(v.from)},
          {"to", date_json(v.to)},         {"columns", columns},          {"runs", runs}};
}

// ---- control chart --------------------------------------------------------------------------------

std::string control_chart_text(const ControlChartView& v) {
  std::string out;
  const auto& s = v.series;
  const auto& l = v.chart.limits;
  const auto& u = s.quantity.unit;
  line(out, fmt::format("Individuals control chart of {} for {}: {}", s.quantity.label, s.instrument_title,
                        period_text(s.points)));
  line(out, fmt::format("  centre line      {} {}", text_number(l.centre), u));
  line(out, fmt::format("  control limits   {} to {} {} (centre +/- 3 sigma, sigma = {} {})", text_number(l.lcl()),
                        text_number(l.ucl()), u, text_number(l.sigma), u));
  line(out, fmt::format("  baseline         checks {} to {} ({} to {})", l.baseline_first + 1,
                        l.baseline_first + l.baseline_count, to_string(s.points[l.baseline_first].date),
                        to_string(s.points[l.baseline_first + l.baseline_count - 1].date)));
  para(out, "Method: " + v.chart.method);
  para(out, "Tolerance: " + tolerance_text(s.quantity) + ".");
  for (const auto& n : v.chart.notes) para(out, "Note: " + n);
  if (s.superseded_left_out)
    para(out, fmt::format("Note: {} superseded result(s) are left out; their corrections are used.",
                          s.superseded_left_out));
  if (s.void_left_out) para(out, fmt::format("Note: {} void run(s) are left out.", s.void_left_out));
  line(out, "");
  if (v.chart.flags.empty()) {
    line(out, "In control: no Western Electric rule is broken.");
  } else {
    line(out, fmt::format("Signals ({}), Western Electric rules:", v.chart.flags.size()));
    for (const auto& f : v.chart.flags) para(out, f.explanation, "  - ", "    ");
  }
  return out;
}

json control_chart_json(const ControlChartView& v) {
  const auto& s = v.series;
  const auto& l = v.chart.limits;
  const auto& u = s.quantity.unit;
  json flags = json::array();
  for (const auto& f : v.chart.flags) {
    json runs = json::array(), dates = json::array();
    for (auto i : f.indices) runs.push_back(s.run_ids[i]), dates.push_back(to_string(s.points[i].date));
    flags.push_back({{"rule", static_cast<int>(f.rule)},
                     {"rule_text", stats::describe(f.rule)},
                     {"side", f.side == stats::Side::above ? "above" : "below"},
                     {"run_ids", runs},
                     {"dates", dates},
                     {"explanation", f.explanation}});
  }
  json points = points_json(s);
  for (std::size_t i = 0; i < points.size(); ++i) points[i]["zone"] = std::string(stats::to_string(v.chart.zones[i]));
  return {{"instrument", s.instrument_id},
          {"quantity", quantity_json(s.quantity)},
          {"baseline", {{"first", l.baseline_first + 1}, {"count", l.baseline_count}}},
          {value_key("centre", u), l.centre},
          {value_key("sigma", u), l.sigma},
          {value_key("average_moving_range", u), l.average_moving_range},
          {value_key("lcl", u), l.lcl()},
          {value_key("ucl", u), l.ucl()},
          {"method", v.chart.method},
          {"notes", v.chart.notes},
          {"in_control", v.chart.in_control()},
          {"flags", flags},
          {"superseded_left_out", s.superseded_left_out},
          {"void_left_out", s.void_left_out},
          {"points", points}};
}

// ---- drift ----------------------------------------------------------------------------------------

std::string drift_text(const DriftView& v) {
  std::string out;
  const auto& s = v.series;
  const auto& d = v.drift;
  const auto& u = s.quantity.unit;
  line(out, fmt::format("Drift of {} for {}: {}", s.quantity.label, s.instrument_title, period_text(s.points)));
  if (!d.fit) {
    para(out, d.message);
    return out;
  }
  line(out, fmt::format("  equation         {}   (d = days since {}, {} in {})", d.equation(), to_string(d.origin),
                        s.quantity.key, u));
  line(out, fmt::format("  R^2              {:.4f}", d.fit->r_squared));
  line(out, fmt::format("  RMSE             {} {}", text_number(d.fit->rmse), u));
  line(out, fmt::format("  slope            {} {} per year (p = {:.3g}; {})", text_number(d.slope_per_day * 365.25), u,
                        d.slope_p_value, d.slope_significant ? "significant" : "not significant"));
  const auto b = d.band(d.span_days);
  line(out, fmt::format("  95 % prediction  {} to {} {} at the last check ({})", text_number(b.lower), text_number(b.upper), u,
                        to_string(d.last)));
  line(out, fmt::format("  tolerance        {}", tolerance_text(s.quantity)));
  line(out, fmt::format("  horizon          {} (no projection beyond it)", to_string(d.horizon)));
  std::string projection;
  switch (d.status) {
    case stats::DriftStatus::reaches_limit:
      projection = fmt::format("reaches the {} limit on {}: {}", d.reached->upper ? "upper" : "lower",
                               to_string(d.reached->date), upper_case(std::string(stats::to_string(d.reached->extent))));
      break;
    case stats::DriftStatus::not_reached_within_horizon:
      projection = fmt::format("no limit reached up to the horizon {}; plumb refuses to project further",
                               to_string(d.horizon));
      break;
    case stats::DriftStatus::no_tolerance: projection = "no tolerance, nothing to project against"; break;
    case stats::DriftStatus::not_enough_data: projection = d.message; break;
  }
  line(out, "  projection       " + projection);
  line(out, "");
  for (const auto& e : d.explanation) para(out, e, "", "  ");
  para(out, "Error bars and U: " + s.quantity.uncertainty_basis + ".", "", "  ");
  if (s.superseded_left_out)
    para(out, fmt::format("{} superseded result(s) are left out; their corrections are used.", s.superseded_left_out),
         "", "  ");
  if (s.void_left_out) para(out, fmt::format("{} void run(s) are left out.", s.void_left_out), "", "  ");
  return out;
}

json drift_json(const DriftView& v) {
  const auto& s = v.series;
  const auto& d = v.drift;
  const auto& u = s.quantity.unit;
  json j = {{"instrument", s.instrument_id}, {"quantity", quantity_json(s.quantity)}, {"points", points_json(s)},
            {"explanation", d.explanation}};
  const char* status[] = {"not_enough_data", "no_tolerance", "reaches_limit", "not_reached_within_horizon"};
  j["status"] = status[static_cast<int>(d.status)];
  if (!d.fit) {
    j["message"] = d.message;
    return j;
  }
  const auto b = d.band(d.span_days);
  j["origin"] = to_string(d.origin);
  j["equation"] = d.equation();
  j[value_key("intercept", u)] = d.fit->coef[0];
  j[value_key("slope", u, "per_day")] = d.slope_per_day;
  j["slope_p_value"] = d.slope_p_value;
  j["slope_significant"] = d.slope_significant;
  j["r_squared"] = d.fit->r_squared;
  j[value_key("rmse", u)] = d.fit->rmse;
  j["prediction_at_last"] = {{"date", to_string(d.last)},
                             {value_key("fitted", u), b.fitted},
                             {value_key("lower", u), b.lower},
                             {value_key("upper", u), b.upper},
                             {"confidence", 0.95}};
  j["horizon"] = to_string(d.horizon);
  if (d.reached)
    j["reached"] = {{"limit", d.reached->upper ? "upper" : "lower"},
                    {value_key("limit", u), d.reached->limit},
                    {"date", to_string(d.reached->date)},
                    {"extent", std::string(stats::to_string(d.reached->extent))}};
  else
    j["reached"] = nullptr;
  return j;
}

// ---- interval review ------------------------------------------------------------------------------

namespace {

void recommendation_text(std::string& out, const stats::IntervalRecommendation& r) {
  line(out, fmt::format("{}: {} ({} -> {} days)", r.method, stats::to_string(r.action), r.current_days,
                        r.recommended_days));
  for (const auto& s : r.reasoning)
    if (s != stats::interval_review_caution) para(out, s, "  - ", "    ");
}

json recommendation_json(const stats::IntervalRecommendation& r) {
  return {{"method", r.method},
          {"action", std::string(stats::to_string(r.action))},
          {"current_days", r.current_days},
          {"recommended_days", r.recommended_days},
          {"reasoning", r.reasoning}};
}

}  // namespace

std::string interval_review_text(const IntervalReviewView& v) {
  std::string out;
  line(out, fmt::format("Interval review of {} (current interval {})", v.instrument_title, v.current.to_string()));
  line(out, fmt::format("RECOMMENDATION: {}, next interval {} days", upper_case(std::string(stats::to_string(v.recommended.action))),
                        v.recommended.recommended_days));
  para(out, v.combination, "", "  ");
  line(out, "");
  recommendation_text(out, v.staircase);
  line(out, "");
  line(out, fmt::format("Control-chart method on {}:", v.quantity_label));
  if (v.control_chart) recommendation_text(out, *v.control_chart);
  line(out, "");
  para(out, std::string("Caution: ") + stats::interval_review_caution, "", "  ");
  return out;
}

json interval_review_json(const IntervalReviewView& v) {
  return {{"instrument", v.instrument_id},
          {"current_interval", v.current.to_string()},
          {"action", std::string(stats::to_string(v.recommended.action))},
          {"recommended_days", v.recommended.recommended_days},
          {"combination", v.combination},
          {"staircase", recommendation_json(v.staircase)},
          {"control_chart", v.control_chart ? recommendation_json(*v.control_chart) : json()},
          {"quantity", v.quantity_label},
          {"caution", stats::interval_review_caution}};
}

}  // namespace plumb::report
