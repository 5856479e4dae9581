#include "report/document/text.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "report/format/text.hpp"

namespace plumb::report {
namespace {

constexpr std::size_t page_columns = 78;
constexpr std::size_t max_key_columns = 30;
constexpr std::size_t signature_columns = 26;

std::string padded(const std::string& s, std::size_t width, bool right) {
  const std::size_t n = text_columns(s);
  if (n >= width) return s;
  return right ? std::string(width - n, ' ') + s : s + std::string(width - n, ' ');
}

class TextFlow {
 public:
  explicit TextFlow(const Document& doc) : doc_(doc) {}

  std::string run() {
    header();
    for (const auto& b : doc_.blocks) std::visit([this](const auto& x) { block(x); }, b);
    closing();
    return out_;
  }

 private:
  void line(const std::string& l) { add_line(out_, l); }
  void wrapped(const std::string& text, const std::string& first, const std::string& indent) {
    for (const auto& l : wrap(text, page_columns, first, indent)) line(l);
  }
  void watermark_line() {
    if (!doc_.header.watermark.empty())
      line(
          fmt::format("*** {} *** {} *** {} ***", doc_.header.watermark, doc_.header.watermark, doc_.header.watermark));
  }

  void header() {
    const auto& h = doc_.header;
    watermark_line();
    line(rule('='));
    line(h.lab_name);
    for (const auto& a : h.address_lines) line(a);
    if (!h.accreditation.empty()) wrapped(h.accreditation, "", "");
    line(rule('='));
    const std::string number = "No. " + h.number;
    const std::string& title = h.title;
    if (text_columns(title) + text_columns(number) + 2 <= page_columns)
      line(title + std::string(page_columns - text_columns(title) - text_columns(number), ' ') + number);
    else {
      line(title);
      line(number);
    }
    if (!h.status.empty()) wrapped("Status: " + h.status, "", "  ");
    if (!h.issued.empty()) line(h.issued);
    line(rule());
  }

  void block(const Heading& h) {
    line("");
    line(h.text);
  }

  // Keys in a column as wide as the block's widest key (up to max_key_columns); a longer key takes its own line.
  void block(const KeyValues& kv) {
    std::size_t keys = 0;
    for (const auto& row : kv.rows)
      if (text_columns(row.first) <= max_key_columns) keys = std::max(keys, text_columns(row.first));
    const std::string indent(keys + 5, ' ');
    for (const auto& [key, value] : kv.rows) {
      if (text_columns(key) > max_key_columns) {
        line("  " + key);
        wrapped(value.empty() ? "-" : value, indent, indent);
      } else {
        wrapped(value.empty() ? "-" : value, "  " + padded(key, keys, false) + "   ", indent);
      }
    }
  }

  // Columns as wide as their widest cell: a table is never wrapped inside a cell, so a value reads whole.
  void block(const Table& t) {
    const std::size_t n = t.headers.size();
    std::vector<std::size_t> width(n, 0);
    for (std::size_t i = 0; i < n; ++i) width[i] = text_columns(t.headers[i]);
    for (const auto& r : t.rows)
      for (std::size_t i = 0; i < n && i < r.size(); ++i) width[i] = std::max(width[i], text_columns(r[i]));
    const auto row = [&](const std::vector<std::string>& cells) {
      std::string l = " ";
      for (std::size_t i = 0; i < n; ++i) {
        const bool right = i < t.right.size() && t.right[i];
        l += " " + padded(i < cells.size() ? cells[i] : "", width[i], right);
      }
      while (!l.empty() && l.back() == ' ') l.pop_back();
      line(l);
    };
    line("");
    row(t.headers);
    std::string under = " ";
    for (std::size_t i = 0; i < n; ++i) under += " " + std::string(width[i], '-');
    line(under);
    for (const auto& r : t.rows) row(r);
  }

  void block(const Paragraph& p) { wrapped(p.text, "  ", "  "); }

  void block(const VerdictBox& v) {
    line("");
    line(v.verdict + "    " + v.detail);
  }

  void block(const ChartBlock& c) {
    wrapped("Chart (drawn in the PDF and HTML renderings): " + c.spec.title, "  ", "    ");
    if (!c.spec.subtitle.empty()) wrapped(c.spec.subtitle, "    ", "    ");
    for (const auto& n : c.spec.notes) wrapped(n, "    ", "    ");
  }

  void block(const Signatures& s) {
    for (const auto& p : s.people) {
      std::string who = p.name.empty() ? "________________________" : p.name;
      if (!p.function.empty()) who += " (" + p.function + ")";
      const std::string indent(signature_columns + 3, ' ');
      wrapped(who, "  " + padded(p.role + ":", signature_columns, false) + " ", indent);
      if (!p.signed_at.empty())
        wrapped(fmt::format("signed electronically on {}: \u201c{}\u201d", p.signed_at, p.meaning), indent, indent);
      else
        line(indent + "signature ____________________  date __________");
    }
  }

  void closing() {
    line(rule());
    if (!doc_.footer.empty()) wrapped(doc_.footer, "", "");
    line(fmt::format("Certificate No. {}, page 1 of 1 (text rendering)", doc_.header.number));
    watermark_line();
  }

  const Document& doc_;
  std::string out_;
};

}  // namespace

std::size_t text_columns(const std::string& s) {
  return static_cast<std::size_t>(
      std::count_if(s.begin(), s.end(), [](char c) { return (static_cast<unsigned char>(c) & 0xC0) != 0x80; }));
}

std::string render_text(const Document& doc) {
  return TextFlow(doc).run();
}

}  // namespace plumb::report
