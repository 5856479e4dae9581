#include "report/dcc/xml_tree.hpp"

#include "core/errors.hpp"

namespace plumb::report::dcc {
namespace {

const xmlChar* xml_chars(const char* s) {
  return reinterpret_cast<const xmlChar*>(s);
}

xmlNsPtr ns_of(xmlNodePtr parent, const char* href) {
  xmlNsPtr ns = xmlSearchNsByHref(parent->doc, parent, xml_chars(href));
  if (!ns) throw StorageError(std::string("DCC writer: namespace ") + href + " is not declared");
  return ns;
}

xmlNodePtr child(xmlNodePtr parent, const char* href, const char* name, const std::string* text) {
  xmlNodePtr n =
      xmlNewTextChild(parent, ns_of(parent, href), xml_chars(name), text ? xml_chars(text->c_str()) : nullptr);
  if (!n) throw StorageError(std::string("DCC writer: libxml2 could not add element ") + name);
  return n;
}

}  // namespace

XmlDoc new_dcc_document() {
  XmlDoc doc(xmlNewDoc(xml_chars("1.0")));
  xmlNodePtr root = xmlNewNode(nullptr, xml_chars("digitalCalibrationCertificate"));
  xmlDocSetRootElement(doc.get(), root);
  xmlSetNs(root, xmlNewNs(root, xml_chars(dcc_namespace), xml_chars("dcc")));
  xmlNewNs(root, xml_chars(si_namespace), xml_chars("si"));
  xmlNewProp(root, xml_chars("schemaVersion"), xml_chars("3.1.2"));
  return doc;
}

xmlNodePtr add(xmlNodePtr parent, const char* name) {
  return child(parent, dcc_namespace, name, nullptr);
}

xmlNodePtr add(xmlNodePtr parent, const char* name, std::string_view text) {
  const std::string t(text);
  return child(parent, dcc_namespace, name, &t);
}

xmlNodePtr add_si(xmlNodePtr parent, const char* name) {
  return child(parent, si_namespace, name, nullptr);
}

xmlNodePtr add_si(xmlNodePtr parent, const char* name, std::string_view text) {
  const std::string t(text);
  return child(parent, si_namespace, name, &t);
}

xmlNodePtr add_text(xmlNodePtr parent, const char* name, std::string_view text) {
  xmlNodePtr n = add(parent, name);
  xmlNodePtr content = add(n, "content", text);
  set_attribute(content, "lang", "en");
  return n;
}

void set_attribute(xmlNodePtr node, const char* name, std::string_view value) {
  const std::string v(value);
  xmlSetProp(node, xml_chars(name), xml_chars(v.c_str()));
}

std::string to_xml_text(xmlDoc* doc) {
  xmlChar* buffer = nullptr;
  int size = 0;
  xmlDocDumpFormatMemoryEnc(doc, &buffer, &size, "UTF-8", 1);
  if (!buffer) throw StorageError("DCC writer: libxml2 could not serialise the document");
  std::string out(reinterpret_cast<const char*>(buffer), static_cast<std::size_t>(size));
  xmlFree(buffer);
  return out;
}

}  // namespace plumb::report::dcc
