#include "report/dcc/xml_tree.hpp"

#include "core/errors.hpp"

namespace plumb::report::dcc {
namespace {

const xmlChar* x(const char* s) {
  return reinterpret_cast<const xmlChar*>(s);
}

xmlNsPtr ns_of(xmlNodePtr parent, const char* href) {
  xmlNsPtr ns = xmlSearchNsByHref(parent->doc, parent, x(href));
  if (!ns) throw StorageError(std::string("DCC writer: namespace ") + href + " is not declared");
  return ns;
}

xmlNodePtr child(xmlNodePtr parent, const char* href, const char* name, const std::string* text) {
  xmlNodePtr n = xmlNewTextChild(parent, ns_of(parent, href), x(name), text ? x(text->c_str()) : nullptr);
  if (!n) throw StorageError(std::string("DCC writer: libxml2 could not add element ") + name);
  return n;
}

}  // namespace

XmlDoc new_dcc_document() {
  XmlDoc doc(xmlNewDoc(x("1.0")));
  xmlNodePtr root = xmlNewNode(nullptr, x("digitalCalibrationCertificate"));
  xmlDocSetRootElement(doc.get(), root);
  xmlSetNs(root, xmlNewNs(root, x(dcc_namespace), x("dcc")));
  xmlNewNs(root, x(si_namespace), x("si"));
  xmlNewProp(root, x("schemaVersion"), x("3.1.2"));
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
  xmlSetProp(node, x(name), x(v.c_str()));
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
