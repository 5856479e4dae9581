#pragma once
// What the chart renderer actually drew, noted at the moment of drawing, element by element.
//
// Why: cairo's SVG surface writes text as glyph outlines and every shape as an anonymous <path>, so the
// SVG alone cannot tell a test (or an auditor's script) which text was written or which path is a data
// point. The renderer therefore keeps this record as it draws and annotate_svg() inserts it into the SVG
// as <title>, <desc> and a <metadata> block. Because an entry is written only where the element is
// drawn (a point skipped by a bug leaves no entry), the record describes the drawing, not the spec.
// The real rendered text is checked separately through the PDF, where pango writes extractable text.
#include <string>
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

/// Inserts <title>, <desc> and <metadata> (namespace urn:x-plumb:chart:1) right after the opening
/// <svg> tag of cairo's output. Throws std::logic_error if `svg` has no <svg> tag.
std::string annotate_svg(std::string svg, std::string_view title, std::string_view description,
                         const DrawRecord& record);

}  // namespace plumb::report
