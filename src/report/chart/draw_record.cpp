#include "report/chart/draw_record.hpp"

#include <stdexcept>

namespace plumb::report {

std::string xml_escape(std::string_view s) {
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

std::string annotate_svg(std::string svg, std::string_view title, std::string_view description,
                         const DrawRecord& record) {
  const auto open = svg.find("<svg");
  const auto end = open == std::string::npos ? open : svg.find('>', open);
  if (end == std::string::npos) throw std::logic_error("annotate_svg: no <svg> element in the rendered output");
  std::string block = "\n<title>" + xml_escape(title) + "</title>\n<desc>" + xml_escape(description) +
                      "</desc>\n<metadata>\n<chart xmlns=\"urn:x-plumb:chart:1\">\n";
  for (const auto& e : record.elements) {
    block += "<" + e.kind;
    for (const auto& [k, v] : e.attributes) block += " " + k + "=\"" + xml_escape(v) + "\"";
    block += e.text.empty() ? "/>\n" : ">" + xml_escape(e.text) + "</" + e.kind + ">\n";
  }
  block += "</chart>\n</metadata>";
  svg.insert(end + 1, block);
  return svg;
}

}  // namespace plumb::report
