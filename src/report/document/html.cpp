#include "report/document/html.hpp"

#include <fmt/format.h>

#include "report/chart/chart.hpp"
#include "report/history/html_report.hpp"

namespace plumb::report {
namespace {

constexpr const char* certificate_css = R"(
body { font-family: "DejaVu Sans", sans-serif; color: #1d2733; max-width: 52em; margin: 1.5em auto; padding: 0 1em;
       line-height: 1.35; }
header.lab { display: flex; justify-content: space-between; border-bottom: 2px solid #1d2733; padding-bottom: .5em; }
header.lab .name { font-size: 1.3em; font-weight: bold; }
header.lab .addr, .meta { color: #56606b; font-size: .9em; }
header.lab .number { text-align: right; font-weight: bold; }
h1 { font-size: 1.5em; margin: .6em 0 .1em; }
h2 { font-size: 1.1em; border-bottom: 1px solid #c9d0d8; margin-top: 1.4em; }
dl.kv { display: grid; grid-template-columns: 14em 1fr; gap: .15em 1em; margin: .4em 0; }
dl.kv dt { color: #56606b; } dl.kv dd { margin: 0; }
table { border-collapse: collapse; width: 100%; font-size: .9em; margin: .4em 0; }
th { background: #e8edf2; text-align: left; } th, td { padding: .2em .45em; border-bottom: 1px solid #e3e7eb; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; }
p.small { font-size: .85em; } p.italic { font-style: italic; }
.verdict { border: 2px solid #1f6f43; padding: .5em 1em; margin: .6em 0; font-weight: bold; }
.verdict.fail { border-color: #a3262a; }
.verdict .detail { font-weight: normal; display: block; }
.chart svg { max-width: 100%; height: auto; }
.signatures { display: grid; grid-template-columns: 1fr 1fr; gap: 1em; }
.signatures .role { font-weight: bold; } .signatures .line { border-bottom: 1px solid #1d2733; height: 2em; }
footer { border-top: 1px solid #c9d0d8; margin-top: 2em; color: #56606b; font-size: .8em; }
.mark { color: #a3262a; font-weight: bold; border: 2px solid #a3262a; padding: .3em .6em; margin: .5em 0; }
.watermark { position: fixed; top: 40%; left: 0; right: 0; text-align: center; transform: rotate(-35deg);
             font-size: 7em; font-weight: bold; color: rgba(163, 38, 42, .14); pointer-events: none; z-index: 10; }
)";

std::string e(const std::string& s) {
  return html_escape(s);
}

class HtmlFlow {
 public:
  explicit HtmlFlow(const Document& doc) : doc_(doc) {}

  std::string run() {
    const auto& h = doc_.header;
    out_ =
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
        "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n";
    out_ += fmt::format("<title>{} {}</title>\n<style>{}</style>\n</head>\n<body>\n", e(h.title), e(h.number),
                        certificate_css);
    if (!h.watermark.empty()) {
      out_ += fmt::format("<div class=\"watermark\" aria-hidden=\"true\">{}</div>\n", e(h.watermark));
      out_ += fmt::format("<p class=\"mark\">{}</p>\n", e(h.watermark + ": " + h.status));
    }
    out_ += "<header class=\"lab\">\n<div>\n";
    out_ += fmt::format("<div class=\"name\">{}</div>\n", e(h.lab_name));
    for (const auto& a : h.address_lines) out_ += fmt::format("<div class=\"addr\">{}</div>\n", e(a));
    if (!h.accreditation.empty()) out_ += fmt::format("<div class=\"addr\">{}</div>\n", e(h.accreditation));
    out_ += fmt::format(
        "</div>\n<div class=\"number\">Certificate No. {}<br><span class=\"meta\">Status: {}</span>"
        "</div>\n</header>\n",
        e(h.number), e(h.status));
    out_ += fmt::format("<h1>{}</h1>\n<p class=\"meta\">{}</p>\n", e(h.title), e(h.issued));
    for (const auto& b : doc_.blocks) std::visit([this](const auto& x) { block(x); }, b);
    out_ += fmt::format("<footer>\n<p>{}</p>\n<p>Certificate No. {}, page 1 of 1 (HTML rendering)</p>\n</footer>\n",
                        e(doc_.footer), e(h.number));
    if (!h.watermark.empty()) out_ += fmt::format("<p class=\"mark\">{}</p>\n", e(h.watermark + ": " + h.status));
    out_ += "</body>\n</html>\n";
    return out_;
  }

 private:
  void block(const Heading& h) { out_ += fmt::format("<h2>{}</h2>\n", e(h.text)); }

  void block(const KeyValues& kv) {
    out_ += "<dl class=\"kv\">\n";
    for (const auto& [k, v] : kv.rows) out_ += fmt::format("<dt>{}</dt><dd>{}</dd>\n", e(k), e(v));
    out_ += "</dl>\n";
  }

  void block(const Table& t) {
    const auto right = [&](std::size_t i) { return i < t.right.size() && t.right[i]; };
    out_ += "<table>\n<thead><tr>";
    for (std::size_t i = 0; i < t.headers.size(); ++i)
      out_ += fmt::format("<th{}>{}</th>", right(i) ? " class=\"num\"" : "", e(t.headers[i]));
    out_ += "</tr></thead>\n<tbody>\n";
    for (const auto& r : t.rows) {
      out_ += "<tr>";
      for (std::size_t i = 0; i < r.size(); ++i)
        out_ += fmt::format("<td{}>{}</td>", right(i) ? " class=\"num\"" : "", e(r[i]));
      out_ += "</tr>\n";
    }
    out_ += "</tbody>\n</table>\n";
  }

  void block(const Paragraph& p) {
    std::string cls = p.small ? "small" : "";
    if (p.italic) cls += cls.empty() ? "italic" : " italic";
    out_ += fmt::format("<p{}>{}</p>\n", cls.empty() ? "" : " class=\"" + cls + "\"", e(p.text));
  }

  void block(const VerdictBox& v) {
    out_ += fmt::format("<div class=\"verdict{}\">{}<span class=\"detail\">{}</span></div>\n", v.pass ? "" : " fail",
                        e(v.verdict), e(v.detail));
  }

  void block(const ChartBlock& c) {
    // The SVG defines no ids (svg_writer.hpp), so any number of charts sit in one page as they are.
    out_ += "<div class=\"chart\">\n" + chart_svg(c.spec) + "</div>\n";
  }

  void block(const Signatures& s) {
    out_ += "<div class=\"signatures\">\n";
    for (const auto& p : s.people) {
      out_ +=
          fmt::format("<div><div class=\"role\">{}</div><div>{}</div>", e(p.role), e(p.name.empty() ? " " : p.name));
      if (!p.function.empty()) out_ += fmt::format("<div class=\"meta\">{}</div>", e(p.function));
      if (!p.signed_at.empty())
        out_ += fmt::format("<div><em>Signed electronically on {}: \u201c{}\u201d</em></div>", e(p.signed_at),
                            e(p.meaning));
      else
        out_ += "<div class=\"line\"></div><div class=\"meta\">signature, date</div>";
      out_ += "</div>\n";
    }
    out_ += "</div>\n";
  }

  const Document& doc_;
  std::string out_;
};

}  // namespace

std::string render_html(const Document& doc) {
  return HtmlFlow(doc).run();
}

}  // namespace plumb::report
