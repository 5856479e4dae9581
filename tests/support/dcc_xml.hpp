#pragma once
// Reading plumb's DCC output in tests with libxml2 itself (not with plumb's own DCC code): parse, validate
// against the DCC 3.1.2 schema of the reference data with xmlSchemaValidateDoc, and read values by XPath
// with the dcc and si prefixes bound. Header-only.
#include <libxml/parser.h>
#include <libxml/xmlschemas.h>
#include <libxml/xpath.h>
#include <libxml/xpathInternals.h>

#include <filesystem>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "support/paths.hpp"

namespace plumb::test {

struct XmlDocFree {
  void operator()(xmlDoc* d) const { xmlFreeDoc(d); }
};
using TestXmlDoc = std::unique_ptr<xmlDoc, XmlDocFree>;

/// The schema the DCC must validate against, when the reference data is present.
inline std::optional<std::filesystem::path> dcc_schema_path() {
  const auto root = reference_data();
  if (!root) return std::nullopt;
  const auto xsd = *root / "dcc" / "dcc-3.1.2-local.xsd";
  if (!std::filesystem::is_regular_file(xsd)) return std::nullopt;
  return xsd;
}

inline void quiet_xml_errors(void*, xmlErrorPtr) {}

/// Parses XML text (no network, no entity substitution); null when it is not well-formed.
inline TestXmlDoc parse_xml(const std::string& text) {
  xmlSetStructuredErrorFunc(nullptr, quiet_xml_errors);
  return TestXmlDoc(xmlReadMemory(text.data(), static_cast<int>(text.size()), nullptr, "UTF-8", XML_PARSE_NONET));
}

/// 0 when `doc` is valid against the XSD `schema`; libxml2's error code otherwise (-1: schema not loaded).
inline int validate_against(xmlDoc* doc, const std::filesystem::path& schema) {
  xmlSetStructuredErrorFunc(nullptr, quiet_xml_errors);
  xmlSchemaParserCtxtPtr parser = xmlSchemaNewParserCtxt(schema.c_str());
  xmlSchemaPtr xsd = parser ? xmlSchemaParse(parser) : nullptr;
  int result = -1;
  if (xsd) {
    xmlSchemaValidCtxtPtr valid = xmlSchemaNewValidCtxt(xsd);
    result = xmlSchemaValidateDoc(valid, doc);
    xmlSchemaFreeValidCtxt(valid);
    xmlSchemaFree(xsd);
  }
  if (parser) xmlSchemaFreeParserCtxt(parser);
  return result;
}

/// The nodes an XPath expression selects (prefixes dcc: and si:).
inline std::vector<xmlNodePtr> xpath_nodes(xmlDoc* doc, const std::string& path) {
  xmlXPathContextPtr ctx = xmlXPathNewContext(doc);
  xmlXPathRegisterNs(ctx, BAD_CAST "dcc", BAD_CAST "https://ptb.de/dcc");
  xmlXPathRegisterNs(ctx, BAD_CAST "si", BAD_CAST "https://ptb.de/si");
  xmlXPathObjectPtr r = xmlXPathEvalExpression(BAD_CAST path.c_str(), ctx);
  std::vector<xmlNodePtr> out;
  if (r && r->nodesetval)
    for (int i = 0; i < r->nodesetval->nodeNr; ++i) out.push_back(r->nodesetval->nodeTab[i]);
  xmlXPathFreeObject(r);
  xmlXPathFreeContext(ctx);
  return out;
}

inline std::string node_text(xmlNodePtr n) {
  xmlChar* c = xmlNodeGetContent(n);
  std::string s = c ? reinterpret_cast<const char*>(c) : "";
  xmlFree(c);
  return s;
}

/// The texts of every node `path` selects.
inline std::vector<std::string> xpath_texts(xmlDoc* doc, const std::string& path) {
  std::vector<std::string> out;
  for (xmlNodePtr n : xpath_nodes(doc, path)) out.push_back(node_text(n));
  return out;
}

/// The text of the one node `path` selects; "<none>" or "<several>" otherwise, so a check on it fails visibly.
inline std::string xpath_text(xmlDoc* doc, const std::string& path) {
  const auto texts = xpath_texts(doc, path);
  if (texts.empty()) return "<none>";
  if (texts.size() > 1) return "<several>";
  return texts[0];
}

/// A blank-separated D-SI list as its items.
inline std::vector<std::string> list_items(const std::string& text) {
  std::vector<std::string> out;
  std::string item;
  for (char c : text + " ") {
    if (c == ' ' || c == '\n' || c == '\t') {
      if (!item.empty()) out.push_back(item);
      item.clear();
    } else {
      item += c;
    }
  }
  return out;
}

}  // namespace plumb::test
