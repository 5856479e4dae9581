#include "report/html_report.hpp"

#include <fmt/format.h>

#include <regex>

namespace plumb::report {
namespace {

constexpr const char* css = R"(
body { font-family: "DejaVu Sans", Verdana, sans-serif; color: #1a1a1a; margin: 2em auto; max-width: 1100px;
       padding: 0 1em; line-height: 1.4; }
h1 { font-size: 1.5em; margin-bottom: 0.2em; } h2 { font-size: 1.25em; border-bottom: 2px solid #1a1a1a;
     margin-top: 2em; } h3 { font-size: 1.05em; margin-top: 1.4em; }
.meta { color: #555; font-size: 0.9em; }
table { border-collapse: collapse; font-size: 0.82em; margin: 0.6em 0; }
th, td { padding: 0.2em 0.6em; border-bottom: 1px solid #ddd; text-align: left; }
th { background: #e8ecf2; } td.num { text-align: right; font-variant-numeric: tabular-nums; }
tr.superseded td { color: #777; text-decoration: line-through; }
.status-ok { color: #00795a; font-weight: bold; } .status-bad { color: #b84a00; font-weight: bold; }
.chart svg { max-width: 100%; height: auto; border: 1px solid #eee; margin: 0.5em 0; }
.findings li { margin: 0.2em 0; } .caution { font-style: italic; color: #444; border-left: 3px solid #b84a00;
     padding-left: 0.8em; margin-top: 2em; }
details summary { cursor: pointer; color: #0b5c8e; }
)";

std::string num(std::optional<double> v) { return v ? fmt::format("{:.4g}", *v) : "&ndash;"; }

std::string status_class(const std::string& status) {
  return status == "in date" || status == "due" ? "status-ok" : "status-bad";
}

void due_table(std::string& out, const std::vector<DueRow>& due) {
  out += "<table><tr><th>Kind</th><th>Id</th><th>Location</th><th>Status</th><th>Due on</th><th>Days left</th>"
         "<th>Detail</th></tr>\n";
  for (const auto& d : due)
    out += fmt::format("<tr><td>{}</td><td>{}</td><td>{}</td><td class=\"{}\">{}</td><td>{}</td><td class=\"num\">{}"
                       "</td><td>{}</td></tr>\n",
                       html_escape(d.kind), html_escape(d.id), html_escape(d.location), status_class(d.status),
                       html_escape(d.status), d.due_on ? to_string(*d.due_on) : "&ndash;",
                       d.days_left ? std::to_string(*d.days_left) : "", html_escape(d.detail));
  out += "</table>\n";
}

void history_table(std::string& out, const HistoryView& h) {
  out += "<table><tr><th>Run</th><th>Date</th><th>Operator</th>";
  for (const auto& c : h.columns)
    out += fmt::format("<th>{} ({})</th><th>U</th>", html_escape(c.key), html_escape(c.unit));
  out += "<th>Verdict</th><th>Next due</th><th>Note</th></tr>\n";
  for (auto it = h.rows.rbegin(); it != h.rows.rend(); ++it) {  // newest first: what a reviewer reads first
    const auto& r = *it;
    out += fmt::format("<tr{}><td class=\"num\">{}</td><td>{}</td><td>{}</td>",
                       r.superseded_by ? " class=\"superseded\"" : "", r.run_id, to_string(r.date),
                       html_escape(r.operator_name));
    for (std::size_t i = 0; i < h.columns.size(); ++i)
      out += fmt::format("<td class=\"num\">{}</td><td class=\"num\">{}</td>", num(r.values[i]),
                         num(r.uncertainties[i]));
    std::string note;
    if (r.superseded_by) note = fmt::format("superseded by run {}", *r.superseded_by);
    if (r.supersedes) note += fmt::format("{}corrects run {}", note.empty() ? "" : "; ", *r.supersedes);
    out += fmt::format("<td class=\"{}\">{}</td><td>{}</td><td>{}</td></tr>\n",
                       r.verdict == "pass" ? "status-ok" : "status-bad", html_escape(r.verdict),
                       r.next_due ? to_string(*r.next_due) : "&ndash;", html_escape(note));
  }
  out += "</table>\n<p class=\"meta\">U: expanded uncertainty, k = 2. ";
  for (const auto& c : h.columns)
    out += fmt::format("{}: {}; tolerance {}. ", html_escape(c.key), html_escape(c.uncertainty_basis),
                       html_escape(c.tolerance_basis));
  out += "</p>\n";
}

}  // namespace

std::string html_escape(std::string_view s) {
  std::string out;
  out.reserve(s.size());
  for (char c : s) {
    switch (c) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      default: out += c;
    }
  }
  return out;
}

std::string inline_svg(const std::string& svg, const std::string& prefix) {
  std::string s = svg;
  if (s.rfind("<?xml", 0) == 0) s.erase(0, s.find("?>") + 2);
  s = std::regex_replace(s, std::regex(R"( xmlns(:xlink)?="http://www\.w3\.org/[^"]*")"), "");
  s = std::regex_replace(s, std::regex(R"((\s)id=")"), "$1id=\"" + prefix);
  s = std::regex_replace(s, std::regex(R"(href="#)"), "href=\"#" + prefix);
  s = std::regex_replace(s, std::regex(R"(url\(#)"), "url(#" + prefix);
  return s;
}

std::string html_report(const HtmlReport& r) {
  std::string out = "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n";
  out += fmt::format("<title>{}: instrument history on {}</title>\n<style>{}</style>\n</head>\n<body>\n",
                     html_escape(r.lab_name), to_string(r.on), css);
  out += fmt::format("<h1>{}</h1>\n<p class=\"meta\">Instrument history report for {}, on {}. Generated by plumb "
                     "from its database; every chart and table below is computed from the stored check results.</p>\n",
                     html_escape(r.lab_name), html_escape(r.scope), to_string(r.on));
  out += "<h2>Status and due list</h2>\n";
  due_table(out, r.due);
  int chart_no = 0;
  for (const auto& inst : r.instruments) {
    out += fmt::format("<h2 id=\"{}\">{}</h2>\n<p class=\"meta\">{} &middot; status: <span class=\"{}\">{}</span>"
                       "</p>\n",
                       html_escape(inst.id), html_escape(inst.title), html_escape(inst.location),
                       status_class(inst.status), html_escape(inst.status));
    if (!inst.findings.empty()) {
      out += "<ul class=\"findings\">\n";
      for (const auto& f : inst.findings) out += "<li>" + html_escape(f) + "</li>\n";
      out += "</ul>\n";
    }
    for (const auto& svg : inst.svg_charts)
      out += "<div class=\"chart\">\n" + inline_svg(svg, fmt::format("c{}-", ++chart_no)) + "\n</div>\n";
    out += fmt::format("<h3>History ({} check runs, newest first)</h3>\n", inst.history.rows.size());
    history_table(out, inst.history);
  }
  out += "<p class=\"caution\">" + html_escape(r.caution) + "</p>\n</body>\n</html>\n";
  return out;
}

}  // namespace plumb::report
