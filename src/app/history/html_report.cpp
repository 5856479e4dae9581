#include "app/history/html_report.hpp"

#include <fmt/format.h>

#include <SQLiteCpp/Statement.h>

#include <algorithm>

#include "app/history/trends.hpp"
#include "app/registry/lab.hpp"
#include "app/status/due.hpp"
#include "core/errors.hpp"
#include "report/history/charts.hpp"
#include "store/file_output.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

std::vector<std::string> instrument_ids(store::Database& db) {
  std::vector<std::string> ids;
  SQLite::Statement q(db.sql(), "SELECT id FROM instruments ORDER BY id COLLATE natural_id");
  while (q.executeStep()) ids.push_back(q.getColumn(0).getString());
  return ids;
}

void require_html_path(const std::filesystem::path& p) {
  std::string ext = p.extension().string();
  std::transform(ext.begin(), ext.end(), ext.begin(), [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  if (ext != ".html" && ext != ".htm") throw InputError(fmt::format("--html \"{}\" must end in .html.", p.string()));
  const auto folder = p.parent_path();
  if (!folder.empty() && !std::filesystem::is_directory(folder))
    throw InputError(fmt::format("--html \"{}\": the folder \"{}\" does not exist.", p.string(), folder.string()));
}

std::string svg_of(const report::ChartSpec& spec) { return report::render_chart(spec, report::ChartFormat::svg); }

// The trend findings and charts of one quantity; a statistic that cannot be computed says why instead.
void add_trends(store::Database& db, const InstrumentInfo& inst, const HistoryQuantity& q, report::InstrumentSection& s) {
  const report::SeriesView series = series_view(db, inst, q, {});
  const report::HistoryChartMarks marks = chart_marks(series, history_view(db, inst, {}));
  if (series.points.size() < 2) {
    s.findings.push_back(fmt::format("{}: {} result(s), too few for a control chart or a drift line.",
                                     series.quantity.label, series.points.size()));
    return;
  }
  try {
    report::ControlChartView cc{series, stats::individuals_chart(series.points, {std::nullopt, q.unit})};
    s.findings.push_back(cc.chart.in_control()
                             ? fmt::format("{}: in control, no Western Electric rule is broken.", series.quantity.label)
                             : fmt::format("{}: {} Western Electric signal(s); the latest: {}", series.quantity.label,
                                           cc.chart.flags.size(), cc.chart.flags.back().explanation));
    s.svg_charts.push_back(svg_of(control_chart_spec(cc, marks)));
  } catch (const InputError& e) {
    s.findings.push_back(fmt::format("{}: no control chart ({})", series.quantity.label, e.what()));
  }
  report::DriftView dv{series, drift_in_period(series, marks)};
  if (dv.drift.fit) {
    s.findings.push_back(dv.drift.explanation.back());
    s.svg_charts.push_back(svg_of(drift_chart_spec(dv, marks)));
  } else {
    s.findings.push_back(dv.drift.message);
  }
}

}  // namespace

report::HtmlReport history_report(store::Database& db, const HistoryReportRequest& r) {
  report::HtmlReport out;
  out.lab_name = require_lab(db).name;
  out.on = r.on;
  std::vector<std::string> ids;
  if (r.instrument) {
    ids.push_back(find_instrument(db, *r.instrument).id);
    out.scope = "instrument " + *r.instrument;
  } else {
    ids = instrument_ids(db);
    out.scope = "the whole laboratory";
  }
  for (const auto& d : due_items(db, r.on, default_due_window_days, true))
    if (!r.instrument || d.id == *r.instrument || d.kind == "weight")
      out.due.push_back(d);

  const auto standing_of = standings_on(db, r.on, default_due_window_days);
  for (const auto& id : ids) {
    const InstrumentInfo inst = find_instrument(db, id);
    report::InstrumentSection s;
    s.id = inst.id;
    s.title = inst.title;
    s.location = inst.location;
    const auto standing = standing_of.find(standing_key("instrument", id));
    s.status = standing == standing_of.end() ? "in date" : standing->second.status;
    s.history = history_view(db, inst, {});
    const auto keys = quantity_keys(inst.kind);
    // The watched quantities (bias and repeatability of a balance, e_s % and CV of a pipette); the others follow
    // from them (the minimum weight from the SD) or repeat them in another unit.
    for (const auto& q : history_quantities())
      if (q.instrument_kind == inst.kind && q.watched) add_trends(db, inst, q, s);
    if (s.status == "retired") {
      s.findings.push_back(fmt::format("Retired ({}); kept for history, not due for checks.", standing->second.detail));
    } else if (!keys.empty() && !s.history.rows.empty()) {
      const auto review = interval_review(db, {id, keys.front(), {}, std::nullopt});
      s.findings.push_back(fmt::format("Check interval: {} the current {} ({} days recommended). {}",
                                       stats::to_string(review.recommended.action), inst.every.to_string(),
                                       review.recommended.recommended_days, review.combination));
    }
    out.instruments.push_back(std::move(s));
  }
  out.caution = report::history_chart_caution;
  return out;
}

report::HtmlReport write_history_report(store::Database& db, const HistoryReportRequest& r) {
  require_html_path(r.output);
  report::HtmlReport rep = history_report(db, r);
  const std::string html = report::html_report(rep);
  store::write_whole_file(r.output, html, "report file");
  return rep;
}

}  // namespace plumb::app
