#pragma once
// plumb's chart SVG read with libxml2 (a real XML parser: malformed output or a bad escape fails the parse):
// every element in document order with its attributes, the presentation attributes it inherits from its
// enclosing groups (fill, stroke, stroke-opacity ...), its text, and whether it sits inside <metadata>.
#include <libxml/parser.h>
#include <libxml/tree.h>

#include <map>
#include <optional>
#include <string>
#include <vector>

namespace plumb::test {

struct SvgNode {
  std::string name;
  std::map<std::string, std::string> attributes;  ///< own and inherited
  std::string text;                               ///< all text inside, tspans joined by one space
  bool in_metadata = false;
  [[nodiscard]] std::string attr(const std::string& k) const {
    auto it = attributes.find(k);
    return it == attributes.end() ? std::string() : it->second;
  }
};

namespace svg_dom_detail {

inline std::string text_of(xmlNode* n) {
  std::string out;
  for (xmlNode* c = n->children; c != nullptr; c = c->next) {
    if (c->type == XML_TEXT_NODE && c->content != nullptr) {
      out += reinterpret_cast<const char*>(c->content);
    } else if (c->type == XML_ELEMENT_NODE) {
      const std::string inner = text_of(c);
      if (!out.empty() && !inner.empty()) out += ' ';
      out += inner;
    }
  }
  return out;
}

inline void walk(xmlNode* n, std::map<std::string, std::string> inherited, bool in_metadata,
                 std::vector<SvgNode>& out) {
  for (; n != nullptr; n = n->next) {
    if (n->type != XML_ELEMENT_NODE) continue;
    SvgNode node;
    node.name = reinterpret_cast<const char*>(n->name);
    node.in_metadata = in_metadata || node.name == "metadata";
    node.attributes = inherited;
    std::map<std::string, std::string> passed = inherited;
    for (xmlAttr* a = n->properties; a != nullptr; a = a->next) {
      xmlChar* v = xmlNodeListGetString(n->doc, a->children, 1);
      const std::string key = reinterpret_cast<const char*>(a->name);
      const std::string value = v != nullptr ? reinterpret_cast<const char*>(v) : "";
      xmlFree(v);
      node.attributes[key] = value;
      for (const char* p : {"fill", "fill-opacity", "stroke", "stroke-opacity", "stroke-width", "stroke-dasharray"})
        if (key == p) passed[key] = value;
    }
    node.text = text_of(n);
    out.push_back(node);
    walk(n->children, passed, node.in_metadata, out);
  }
}

}  // namespace svg_dom_detail

/// Every element of `svg`; std::nullopt when libxml2 cannot parse it.
inline std::optional<std::vector<SvgNode>> parse_svg(const std::string& svg) {
  xmlDoc* doc = xmlReadMemory(svg.data(), static_cast<int>(svg.size()), "chart.svg", "UTF-8",
                              XML_PARSE_NONET | XML_PARSE_NOERROR | XML_PARSE_NOWARNING);
  if (doc == nullptr) return std::nullopt;
  std::vector<SvgNode> out;
  svg_dom_detail::walk(xmlDocGetRootElement(doc), {}, false, out);
  xmlFreeDoc(doc);
  return out;
}

/// The drawn elements (not the metadata record) named `name`, optionally with inherited attribute k = v.
inline std::vector<SvgNode> drawn(const std::vector<SvgNode>& nodes, const std::string& name,
                                  const std::map<std::string, std::string>& with = {}) {
  std::vector<SvgNode> out;
  for (const auto& n : nodes) {
    if (n.in_metadata || n.name != name) continue;
    bool match = true;
    for (const auto& [k, v] : with) match = match && n.attr(k) == v;
    if (match) out.push_back(n);
  }
  return out;
}

}  // namespace plumb::test
