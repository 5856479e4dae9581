// The pages that show the lab: the overview of what needs attention, the instrument and weight lists, one
// instrument with its history, checks, charts and certificates, and the audit trail with its verification.
#include <fmt/format.h>

#include <algorithm>

#include "app/history/instrument_history.hpp"
#include "app/records/audit.hpp"
#include "app/registry/instrument_page.hpp"
#include "app/registry/weight_details.hpp"
#include "app/status/due.hpp"
#include "app/status/lab_overview.hpp"
#include "app/status/summary.hpp"
#include "core/dates.hpp"
#include "report/records/audit_log.hpp"
#include "store/repository.hpp"
#include "web/chart_source.hpp"
#include "web/pages.hpp"
#include "web/render.hpp"

namespace plumb::web {
namespace {

using nlohmann::json;

/// Lines of the overview's table of what needs attention, and records of an instrument's audit trail, on one page.
constexpr std::size_t overview_attention_shown = 100;
constexpr std::int64_t instrument_audit_shown = 100;

/// The overview's tiles: how many items stand so, and the list that shows them.
json overview_tile(const std::string& label, std::size_t count, const std::string& link, const std::string& tone) {
  return {{"label", label}, {"count", count}, {"link", link}, {"tone", tone}};
}

bool contains_folded(const std::string& haystack, const std::string& needle) {
  const auto fold = [](std::string s) {
    std::transform(s.begin(), s.end(), s.begin(), [](unsigned char ch) { return static_cast<char>(std::tolower(ch)); });
    return s;
  };
  return fold(haystack).find(fold(needle)) != std::string::npos;
}

}  // namespace

WebResponse overview_page(PageContext& c) {
  const int window = c.site.options.due_window_days;
  const auto o = app::lab_overview(c.db, today_local(), window);
  json attention = json::array();
  // The first lines on the page; the lists behind the tiles hold every one.
  for (std::size_t i = 0; i < std::min(o->attention.size(), overview_attention_shown); ++i) {
    const auto& item = o->attention[i];
    const bool weight = item.kind == "weight";
    attention.push_back({{"kind", item.kind},
                         {"id", item.id},
                         {"link", weight ? "/weights" : "/instruments/" + item.id},
                         {"status", item.status},
                         {"due_on", item.due_on ? to_string(*item.due_on) : ""},
                         {"days_left", item.days_left ? json(*item.days_left) : json("")},
                         {"detail", item.detail}});
  }
  json tiles = json::array(
      {overview_tile("overdue", o->overdue, "/instruments?standing=overdue", "alarm"),
       overview_tile(fmt::format("due within {} days", window), o->due, "/instruments?standing=due", "watch"),
       overview_tile("out of service", o->out_of_service, "/instruments?standing=out+of+service", "alarm"),
       overview_tile("retired", o->retired, "/instruments?standing=retired", "quiet"),
       overview_tile("drafts awaiting approval", o->drafts, "/certificates", "watch"),
       overview_tile("reference weights due", o->weights_due, "/weights", "watch")});
  return html_page("overview", "Overview",
                   {{"on", to_string(o->on)},
                    {"window", window},
                    {"tiles", tiles},
                    {"attention", attention},
                    {"has_attention", !attention.empty()},
                    {"attention_shown", attention.size()},
                    {"attention_total", o->attention.size()},
                    {"attention_more", o->attention.size() > attention.size()}},
                   c.visitor);
}

WebResponse instruments_page(PageContext& c) {
  const Date today = today_local();
  const auto standings = app::instrument_standings(c.db, today);
  const std::string q = c.request.param("q"), kind = c.request.param("kind"), standing = c.request.param("standing");
  const std::string sort = c.request.param("sort").empty() ? "id" : c.request.param("sort");
  std::vector<json> rows;
  app::lab_summary(c.db, today, [&](const report::SummaryRow& r) {
    const auto& i = r.instrument;
    const auto s = standings.find(i.id);
    const std::string st = s == standings.end() ? r.status : s->second;
    if (!q.empty() && !contains_folded(i.id, q) && !contains_folded(i.location, q)) return;
    if (!kind.empty() && i.kind != kind) return;
    if (!standing.empty() && st != standing) return;
    rows.push_back({{"id", i.id},
                    {"kind", i.kind},
                    {"location", i.location},
                    {"standing", st},
                    {"tone", st == "in date"   ? "ok"
                             : st == "due"     ? "watch"
                             : st == "retired" ? "quiet"
                                               : "alarm"},
                    {"rank", app::standing_rank(st)},
                    {"next_due", r.next_due ? to_string(*r.next_due) : ""},
                    {"latest", i.latest ? to_string(i.latest->performed_on) : ""},
                    {"verdict", i.latest ? std::string(to_string(i.latest->verdict)) : ""}});
  });
  if (sort == "due")
    std::stable_sort(rows.begin(), rows.end(), [](const json& a, const json& b) {
      const auto& x = a["next_due"].get_ref<const std::string&>();
      const auto& y = b["next_due"].get_ref<const std::string&>();
      return x.empty() != y.empty() ? !x.empty() : x < y;
    });
  else if (sort == "standing")
    std::stable_sort(rows.begin(), rows.end(),
                     [](const json& a, const json& b) { return a["rank"].get<int>() < b["rank"].get<int>(); });
  json kinds = json::array();
  for (const char* k : {"balance", "pipette"}) kinds.push_back({{"value", k}, {"selected", kind == k}});
  json standing_options = json::array();
  for (const auto s : app::standings)
    standing_options.push_back({{"value", std::string(s)}, {"selected", standing == s}});
  json sorts = json::array();
  for (const auto& [value, label] :
       std::vector<std::pair<std::string, std::string>>{{"id", "id"}, {"due", "next due"}, {"standing", "standing"}})
    sorts.push_back({{"value", value}, {"label", label}, {"selected", sort == value}});
  return html_page("instruments", "Instruments",
                   {{"rows", rows},
                    {"count", rows.size()},
                    {"q", q},
                    {"kinds", kinds},
                    {"standings", standing_options},
                    {"sorts", sorts}},
                   c.visitor);
}

WebResponse instrument_item_page(PageContext& c) {
  const std::string id = c.request.path_parts.at(0);
  const auto instrument = app::find_instrument(c.db, id);
  json page = app::instrument_page(c.db, instrument.kind, id, today_local());
  json charts = json::array();
  for (const auto& chart : instrument_charts(c.db, id))
    charts.push_back({{"quantity", chart.quantity},
                      {"src", fmt::format("/instruments/{}/chart/{}.svg", id, chart.quantity)},
                      {"svg", chart.svg}});
  page["charts"] = charts;
  page["is_balance"] = instrument.kind == "balance";
  // The newest records first, a page at a time (?audit_before=SEQ goes further back).
  app::AuditLogFilter filter;
  filter.instrument = id;
  filter.newest = instrument_audit_shown;
  if (const auto before = c.request.param("audit_before"); !before.empty()) filter.before = before;
  const auto log = app::audit_log(c.db, filter);
  json audit = report::audit_log_json(log.scope, log.records, log.authors);
  auto& records = audit["records"];
  std::reverse(records.begin(), records.end());
  audit["shown"] = records.size();
  audit["total"] = log.total;
  audit["paged"] = filter.before.has_value();
  if (log.older && !log.records.empty()) audit["older_than"] = log.records.front().seq;
  page["audit"] = audit;
  return html_page("instrument", instrument.title, page, c.visitor);
}

WebResponse instrument_chart(PageContext& c) {
  WebResponse r;
  r.body = history_chart_svg(c.db, c.request.path_parts.at(0), c.request.path_parts.at(1));
  r.content_type = "image/svg+xml";
  // An image only: its own style attributes are allowed, never a script.
  r.csp = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; frame-ancestors 'self'";
  return r;
}

WebResponse weights_page(PageContext& c) {
  const auto statuses = app::weight_statuses(c.db, today_local());
  const std::string q = c.request.param("q");
  json rows = json::array();
  for (const auto& w : store::list_weights(c.db.sql())) {
    if (!q.empty() && !contains_folded(w.id, q) && !contains_folded(w.weight_class, q)) continue;
    const auto s = statuses.find(w.id);
    const std::string st = s == statuses.end() ? "" : s->second;
    rows.push_back({{"id", w.id},
                    {"nominal", w.nominal_text},
                    {"class", w.weight_class},
                    {"certificate", w.current.certificate_no},
                    {"correction", w.current.correction.to_string()},
                    {"uncertainty", w.current.uncertainty.to_string()},
                    {"due_on", to_string(w.current.due_on)},
                    {"standing", st},
                    {"tone", st == "in date"   ? "ok"
                             : st == "due"     ? "watch"
                             : st == "retired" ? "quiet"
                                               : "alarm"}});
  }
  return html_page("weights", "Reference weights", {{"rows", rows}, {"count", rows.size()}, {"q", q}}, c.visitor);
}

WebResponse audit_page(PageContext& c) {
  app::AuditLogFilter filter;
  if (!c.request.param("from").empty()) filter.from = c.request.param("from");
  if (!c.request.param("to").empty()) filter.to = c.request.param("to");
  // The newest first, at most 500 on one page (the CLI's `audit log` gives all of them).
  filter.newest = 500;
  const auto log = app::audit_log(c.db, filter);
  json j = report::audit_log_json(log.scope, log.records, log.authors);
  json records = json::array();
  const auto& all = j["records"];
  const std::size_t shown = all.size();
  for (std::size_t i = 0; i < shown; ++i) records.push_back(all[all.size() - 1 - i]);
  return html_page("audit", "Audit trail",
                   {{"scope", log.scope},
                    {"records", records},
                    {"total", log.total},
                    {"shown", shown},
                    {"from", c.request.param("from")},
                    {"to", c.request.param("to")}},
                   c.visitor);
}

WebResponse verification_page(PageContext& c) {
  const auto v = app::verify_audit(c.db);
  json problems = json::array();
  for (const auto& p : v.audit.problems) problems.push_back({{"message", p.message}});
  return html_page("verify", "Verification of the trail",
                   {{"ok", v.audit.ok()},
                    {"records", v.audit.records},
                    {"rows", v.audit.rows},
                    {"tables", v.audit.tables},
                    {"checkpoints", v.audit.checkpoints},
                    {"schema_objects", v.audit.schema_objects},
                    {"key_source", v.key_source},
                    {"last_hash", v.audit.last_hash},
                    {"problems", problems}},
                   c.visitor);
}

}  // namespace plumb::web
