#pragma once
// What the chart renderer actually drew, noted at the moment of drawing, element by element.
//
// Why: a shape in an SVG does not say which data it stands for, so the renderer keeps this record as it draws
// and the SVG writer puts it in a <metadata> block (namespace urn:x-plumb:chart:1): a test, or an auditor's
// script, reads which point, limit or trend was drawn where. Because an entry is written only where the element
// is drawn (a point skipped by a bug leaves no entry), the record describes the drawing, not the spec. The text
// itself is real <text> in the SVG and real text in the PDF.
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace plumb::report {

struct DrawnElement {
  std::string kind;  ///< "text", "point", "error-bar", "tolerance-limit", "trend", ...
  std::vector<std::pair<std::string, std::string>> attributes;
  std::string text;  ///< for kind "text"
};

struct DrawRecord {
  std::vector<DrawnElement> elements;
  void add(std::string kind, std::vector<std::pair<std::string, std::string>> attributes, std::string text = {}) {
    elements.push_back({std::move(kind), std::move(attributes), std::move(text)});
  }
};

std::string xml_escape(std::string_view s);

}  // namespace plumb::report
