#pragma once
// Small helpers over libxml2's tree API for writing a DCC: every element and text goes through libxml2
// (xmlNewTextChild escapes the text), never through string concatenation.
#include <libxml/tree.h>

#include <memory>
#include <string>
#include <string_view>

namespace plumb::report::dcc {

inline constexpr const char* dcc_namespace = "https://ptb.de/dcc";
inline constexpr const char* si_namespace = "https://ptb.de/si";

struct DocFree {
  void operator()(xmlDoc* d) const { xmlFreeDoc(d); }
};
using XmlDoc = std::unique_ptr<xmlDoc, DocFree>;

/// A new document whose root is dcc:digitalCalibrationCertificate with the dcc and si namespaces declared.
XmlDoc new_dcc_document();

/// A child element in the dcc namespace, empty or with text.
xmlNodePtr add(xmlNodePtr parent, const char* name);
xmlNodePtr add(xmlNodePtr parent, const char* name, std::string_view text);
/// A child element in the si namespace with text (si:value, si:unit ...), or empty (si:real).
xmlNodePtr add_si(xmlNodePtr parent, const char* name);
xmlNodePtr add_si(xmlNodePtr parent, const char* name, std::string_view text);
/// A dcc:textType or dcc:richContentType element: <name><dcc:content lang="en">text</dcc:content></name>.
xmlNodePtr add_text(xmlNodePtr parent, const char* name, std::string_view text);
/// Sets an attribute (refType, id ...).
void set_attribute(xmlNodePtr node, const char* name, std::string_view value);

/// The document as indented UTF-8 text with its XML declaration.
std::string to_xml_text(xmlDoc* doc);

}  // namespace plumb::report::dcc
