#include "report/chart/svg_writer.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <iterator>

namespace plumb::report {
namespace {

// Two decimals of a point (1/7200 in) are finer than any screen or printer; trailing zeros are dropped.
void number_to(std::string& out, double v) {
  if (std::abs(v) < 0.005) v = 0;  // no "-0"
  auto s = fmt::format("{:.2f}", v);
  while (s.back() == '0') s.pop_back();
  if (s.back() == '.') s.pop_back();
  out += s;
}

std::string hex_colour(const Colour& c) {
  const auto byte = [](double v) { return static_cast<int>(std::lround(std::clamp(v, 0.0, 1.0) * 255)); };
  return fmt::format("#{:02x}{:02x}{:02x}", byte(c.r), byte(c.g), byte(c.b));
}

std::string opacity_text(double a) {
  return fmt::format("{:.3g}", a);
}

// The style attributes of a shape: what a group shares.
std::string style_of(const Shape& s) {
  std::string st;
  if (s.fill) {
    st += " fill=\"" + hex_colour(*s.fill) + "\"";
    if (s.fill->a < 1) st += " fill-opacity=\"" + opacity_text(s.fill->a) + "\"";
  } else {
    st += " fill=\"none\"";
  }
  if (s.stroke) {
    st += " stroke=\"" + hex_colour(s.stroke->colour) + "\"";
    if (s.stroke->colour.a < 1) st += " stroke-opacity=\"" + opacity_text(s.stroke->colour.a) + "\"";
    st += " stroke-width=\"";
    number_to(st, s.stroke->width);
    st += "\"";
    if (!s.stroke->dash.empty()) {
      st += " stroke-dasharray=\"";
      for (std::size_t i = 0; i < s.stroke->dash.size(); ++i) {
        if (i > 0) st += ' ';
        number_to(st, s.stroke->dash[i]);
      }
      st += "\"";
    }
  }
  return st;
}

void geometry_to(std::string& out, const Shape& s) {
  switch (s.kind) {
    case Shape::Kind::rect:
      out += "<rect x=\"";
      number_to(out, s.x);
      out += "\" y=\"";
      number_to(out, s.y);
      out += "\" width=\"";
      number_to(out, s.w);
      out += "\" height=\"";
      number_to(out, s.h);
      out += "\"/>";
      return;
    case Shape::Kind::circle:
      out += "<circle cx=\"";
      number_to(out, s.x);
      out += "\" cy=\"";
      number_to(out, s.y);
      out += "\" r=\"";
      number_to(out, s.w);
      out += "\"/>";
      return;
    case Shape::Kind::path:
      out += "<path d=\"";
      for (const auto& sub : s.subpaths) {
        for (std::size_t i = 0; i < sub.size(); ++i) {
          // A vertical or horizontal segment (error bars, grid, limits) needs one number, not two.
          if (i > 0 && sub[i].first == sub[i - 1].first) {
            out += 'V';
            number_to(out, sub[i].second);
            continue;
          }
          if (i > 0 && sub[i].second == sub[i - 1].second) {
            out += 'H';
            number_to(out, sub[i].first);
            continue;
          }
          out += i == 0 ? 'M' : 'L';
          number_to(out, sub[i].first);
          out += ' ';
          number_to(out, sub[i].second);
        }
        if (s.closed) out += 'Z';
      }
      out += "\"/>";
      return;
  }
}

void text_to(std::string& out, const TextLines& t) {
  out += "<text class=\"" + xml_escape(t.role) + "\" font-size=\"";
  number_to(out, t.font.size);
  out += "\"";
  if (t.font.bold) out += " font-weight=\"bold\"";
  if (t.font.italic) out += " font-style=\"italic\"";
  out += " fill=\"" + hex_colour(t.colour) + "\"";
  if (t.colour.a < 1) out += " fill-opacity=\"" + opacity_text(t.colour.a) + "\"";
  double x = t.x, y = t.y;
  if (t.vertical) {
    out += " transform=\"translate(";
    number_to(out, t.x);
    out += ' ';
    number_to(out, t.y);
    out += ") rotate(-90)\"";
    x = 0, y = 0;
  }
  out += ">";
  for (std::size_t i = 0; i < t.lines.size(); ++i) {
    out += "<tspan x=\"";
    number_to(out, x);
    out += "\" y=\"";
    number_to(out, y + t.ascent + t.line_height * static_cast<double>(i));
    out += "\">" + xml_escape(t.lines[i]) + "</tspan>";
  }
  out += "</text>\n";
}

void metadata_to(std::string& out, const DrawRecord& record) {
  out += "<metadata>\n<chart xmlns=\"urn:x-plumb:chart:1\">\n";
  for (const auto& e : record.elements) {
    out += "<" + e.kind;
    for (const auto& [k, v] : e.attributes) out += " " + k + "=\"" + xml_escape(v) + "\"";
    out += e.text.empty() ? "/>\n" : ">" + xml_escape(e.text) + "</" + e.kind + ">\n";
  }
  out += "</chart>\n</metadata>\n";
}

}  // namespace

void append_svg(std::string& out, const Drawing& d, std::string_view title, std::string_view description,
                const DrawRecord& record) {
  out += "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" width=\"";
  number_to(out, d.width);
  out += "pt\" height=\"";
  number_to(out, d.height);
  out += "pt\" viewBox=\"0 0 ";
  number_to(out, d.width);
  out += ' ';
  number_to(out, d.height);
  out += "\" font-family=\"'DejaVu Sans', Verdana, sans-serif\">\n<title>" + xml_escape(title) + "</title>\n<desc>" +
         xml_escape(description) + "</desc>\n";
  metadata_to(out, record);
  std::string group_style;  // the style of the open <g>, empty when none is open
  const auto close_group = [&] {
    if (!group_style.empty()) out += "</g>\n";
    group_style.clear();
  };
  for (const auto& op : d.ops) {
    if (const auto* s = std::get_if<Shape>(&op)) {
      const std::string st = style_of(*s);
      if (st != group_style) {
        close_group();
        out += "<g" + st + ">";
        group_style = st;
      }
      geometry_to(out, *s);
    } else if (const auto* t = std::get_if<TextLines>(&op)) {
      close_group();
      text_to(out, *t);
    } else if (const auto* c = std::get_if<ClipBegin>(&op)) {
      close_group();
      // A nested viewport clips what it holds to its box; its viewBox keeps the chart's coordinates.
      out += "<svg x=\"";
      number_to(out, c->x);
      out += "\" y=\"";
      number_to(out, c->y);
      out += "\" width=\"";
      number_to(out, c->w);
      out += "\" height=\"";
      number_to(out, c->h);
      out += "\" viewBox=\"";
      number_to(out, c->x);
      out += ' ';
      number_to(out, c->y);
      out += ' ';
      number_to(out, c->w);
      out += ' ';
      number_to(out, c->h);
      out += "\" overflow=\"hidden\">\n";
    } else {
      close_group();
      out += "</svg>\n";
    }
  }
  close_group();
  out += "</svg>\n";
}

}  // namespace plumb::report
