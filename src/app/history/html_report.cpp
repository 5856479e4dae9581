#include "app/history/html_report.hpp"

#include <fmt/format.h>

#include <SQLiteCpp/Statement.h>

#include <algorithm>
#include <cctype>
#include <map>

#include "app/history/report_files.hpp"
#include "app/history/trends.hpp"
#include "app/registry/lab.hpp"
#include "app/status/due.hpp"
#include "core/errors.hpp"
#include "report/history/charts.hpp"
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

// The trend findings and charts of one quantity; a statistic that cannot be computed says why instead.
void add_trends(const RunHistory& h, const HistoryQuantity& q, report::InstrumentSection& s) {
  const report::SeriesView series = series_view(h, q, {});
  const report::HistoryChartMarks marks = chart_marks(series, s.history);
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
    s.charts.push_back(control_chart_spec(cc, marks));
  } catch (const InputError& e) {
    s.findings.push_back(fmt::format("{}: no control chart ({})", series.quantity.label, e.what()));
  }
  report::DriftView dv{series, drift_in_period(series, marks)};
  if (dv.drift.fit) {
    s.findings.push_back(dv.drift.explanation.back());
    s.charts.push_back(drift_chart_spec(dv, marks));
  } else {
    s.findings.push_back(dv.drift.message);
  }
}

report::InstrumentSection section_of(store::Database& db, const std::string& id,
                                     const std::map<std::string, report::DueItem>& standing_of) {
  const InstrumentInfo inst = find_instrument(db, id);
  report::InstrumentSection s;
  s.id = inst.id;
  s.title = inst.title;
  s.location = inst.location;
  const auto standing = standing_of.find(standing_key("instrument", id));
  s.status = standing == standing_of.end() ? "in date" : standing->second.status;
  // The history is read once; the table, the watched quantities and the interval review all use it.
  const RunHistory h = read_run_history(db, inst);
  s.history = history_view(h, {});
  const auto keys = quantity_keys(inst.kind);
  // The watched quantities (bias and repeatability of a balance, e_s % and CV of a pipette); the others follow
  // from them (the minimum weight from the SD) or repeat them in another unit.
  for (const auto& q : history_quantities())
    if (q.instrument_kind == inst.kind && q.watched) add_trends(h, q, s);
  if (s.status == "retired") {
    s.findings.push_back(fmt::format("Retired ({}); kept for history, not due for checks.", standing->second.detail));
  } else if (!keys.empty() && !s.history.rows.empty()) {
    const auto review = interval_review(h, find_quantity(keys.front(), inst), {});
    s.findings.push_back(fmt::format("Check interval: {} the current {} ({} days recommended). {}",
                                     stats::to_string(review.recommended.action), inst.every.to_string(),
                                     review.recommended.recommended_days, review.combination));
  }
  return s;
}

// A page's file name: the instrument id with anything but letters, digits, '.', '_' and '-' replaced, after its
// place in the list (so two ids that differ only in such characters get two pages, and no id reaches outside the
// folder).
std::string page_file_name(std::size_t index, const std::string& id) {
  std::string safe;
  for (unsigned char c : id) safe += std::isalnum(c) != 0 || c == '_' || c == '-' ? static_cast<char>(c) : '_';
  return fmt::format("{:04d}-{}.html", index + 1, safe);
}

// A relative link to a file name: every byte outside the unreserved characters of RFC 3986 percent-encoded,
// so a report named "lab #2.html" still links its pages.
std::string href_of(const std::string& name) {
  std::string out;
  for (unsigned char c : name)
    out += std::isalnum(c) != 0 || c == '-' || c == '.' || c == '_' || c == '~' ? std::string(1, static_cast<char>(c))
                                                                                : fmt::format("%{:02X}", c);
  return out;
}

}  // namespace

report::InstrumentSection instrument_section(store::Database& db, const std::string& instrument_id, Date on) {
  return section_of(db, find_instrument(db, instrument_id).id, standings_on(db, on, default_due_window_days));
}

std::filesystem::path instrument_pages_folder(const std::filesystem::path& overview) {
  return overview.parent_path() / (overview.stem().string() + "-instruments");
}

HistoryReportWritten write_history_report(store::Database& db, const HistoryReportRequest& r) {
  require_html_path(r.output);
  report::ReportHeading heading;
  heading.lab_name = require_lab(db).name;
  heading.on = r.on;
  heading.caution = report::history_chart_caution;
  std::vector<report::DueItem> due;
  std::optional<std::string> only;
  if (r.instrument) {
    only = find_instrument(db, *r.instrument).id;
    heading.scope = "instrument " + *only;
  } else {
    heading.scope = "the whole laboratory";
  }
  for (auto& d : due_items(db, r.on, default_due_window_days, true))
    if (!only || d.id == *only || d.kind == "weight") due.push_back(std::move(d));
  const auto standing_of = standings_on(db, r.on, default_due_window_days);

  HistoryReportWritten written;
  written.overview = r.output;
  ReportFiles files;
  std::string buffer;
  if (only) {
    files.start(r.output);
    report::append_instrument_page(buffer, heading, section_of(db, *only, standing_of), &due, "");
    files.write(buffer);
    files.finish();
    written.instruments = 1;
    files.keep();
    return written;
  }
  const auto folder = instrument_pages_folder(r.output);
  files.make_folder(folder);
  written.folder = folder;
  const std::string back = "../" + href_of(r.output.filename().string());
  std::vector<report::OverviewRow> rows;
  const auto ids = instrument_ids(db);
  for (std::size_t i = 0; i < ids.size(); ++i) {
    const auto section = section_of(db, ids[i], standing_of);
    const std::string page = page_file_name(i, section.id);
    files.start(folder / page);
    report::append_instrument_page(buffer, heading, section, nullptr, back);
    files.write(buffer);
    files.finish();
    rows.push_back({section.id, section.title, section.location, section.status,
                    href_of(folder.filename().string()) + "/" + page, section.history.rows.size(),
                    section.findings.empty() ? std::string() : section.findings.front()});
  }
  files.start(r.output);
  report::append_overview_start(buffer, heading, due);
  for (const auto& row : rows) {
    report::append_overview_row(buffer, row);
    if (buffer.size() > (1U << 20U)) files.write(buffer);
  }
  report::append_overview_end(buffer, heading, rows.size());
  files.write(buffer);
  files.finish();
  written.instruments = rows.size();
  files.keep();
  return written;
}

}  // namespace plumb::app
