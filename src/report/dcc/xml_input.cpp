#include "report/dcc/xml_input.hpp"

#include <fmt/format.h>
#include <libxml/parser.h>
#include <libxml/xmlIO.h>
#include <libxml/xmlerror.h>
#include <libxml/xmlschemas.h>

#include <algorithm>
#include <fstream>
#include <iterator>
#include <memory>

#include "core/errors.hpp"

namespace plumb::report::dcc {
namespace {

/// Collects libxml2's messages instead of letting it print them: a command prints one sentence of its own.
class ErrorCapture {
 public:
  ErrorCapture() {
    xmlSetStructuredErrorFunc(this, &ErrorCapture::collect);
    xmlSetExternalEntityLoader(xmlNoNetExternalEntityLoader);
  }
  ~ErrorCapture() { xmlSetStructuredErrorFunc(nullptr, nullptr); }
  ErrorCapture(const ErrorCapture&) = delete;
  ErrorCapture& operator=(const ErrorCapture&) = delete;

  [[nodiscard]] const std::string& first() const { return first_; }

  static void collect(void* self, xmlErrorPtr e) {
    auto* capture = static_cast<ErrorCapture*>(self);
    if (!e || !capture->first_.empty() || e->level == XML_ERR_WARNING) return;
    std::string message = e->message ? e->message : "unknown error";
    while (!message.empty() && (message.back() == '\n' || message.back() == ' ')) message.pop_back();
    capture->first_ = e->line > 0 ? fmt::format("line {}: {}", e->line, message) : message;
  }

 private:
  std::string first_;
};

struct ParserFree {
  void operator()(xmlParserCtxt* c) const { xmlFreeParserCtxt(c); }
};
struct SchemaParserFree {
  void operator()(xmlSchemaParserCtxt* c) const { xmlSchemaFreeParserCtxt(c); }
};
struct SchemaFree {
  void operator()(xmlSchema* s) const { xmlSchemaFree(s); }
};
struct ValidFree {
  void operator()(xmlSchemaValidCtxt* c) const { xmlSchemaFreeValidCtxt(c); }
};

}  // namespace

XmlDoc parse_untrusted_xml(std::string_view text, std::string_view field) {
  if (text.size() > max_xml_bytes)
    throw InputError(fmt::format("{} is larger than {} MiB; a DCC of one item is a few kilobytes.", field,
                                 max_xml_bytes / (std::size_t{1024} * 1024)));
  ErrorCapture errors;
  std::unique_ptr<xmlParserCtxt, ParserFree> parser(xmlNewParserCtxt());
  if (!parser) throw StorageError("libxml2 could not create a parser.");
  // NONET: no network; without NOENT and DTDLOAD no entity is substituted and no external DTD is read.
  const int options = XML_PARSE_NONET | XML_PARSE_NOERROR | XML_PARSE_NOWARNING;
  XmlDoc doc(xmlCtxtReadMemory(parser.get(), text.data(), static_cast<int>(text.size()), nullptr, "UTF-8", options));
  if (!doc)
    throw InputError(
        fmt::format("{} is not well-formed XML ({}).", field, errors.first().empty() ? "no document" : errors.first()));
  if (doc->intSubset || doc->extSubset) {
    // libxml2 keeps no line for the DTD node; the declaration's own text says where it is.
    const auto at = text.find("<!DOCTYPE");
    const auto line =
        1 + std::count(text.begin(), text.begin() + static_cast<std::ptrdiff_t>(at == std::string_view::npos ? 0 : at),
                       '\n');
    throw InputError(
        fmt::format("{} line {}: declares a DOCTYPE, which a DCC never has; refused, as it could "
                    "pull in external entities.",
                    field, line));
  }
  return doc;
}

XmlDoc read_untrusted_xml(const std::filesystem::path& path, std::string_view field) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(fmt::format("{}: cannot read the file.", field));
  std::string text;
  text.resize(max_xml_bytes + 1);
  in.read(text.data(), static_cast<std::streamsize>(text.size()));
  text.resize(static_cast<std::size_t>(in.gcount()));
  return parse_untrusted_xml(text, field);
}

std::optional<std::string> schema_violation(xmlDoc* doc, const std::filesystem::path& schema,
                                            std::string_view schema_field) {
  ErrorCapture errors;
  if (!std::filesystem::is_regular_file(schema))
    throw InputError(fmt::format("{} \"{}\" is not a readable schema file.", schema_field, schema.string()));
  std::unique_ptr<xmlSchemaParserCtxt, SchemaParserFree> parser(xmlSchemaNewParserCtxt(schema.c_str()));
  std::unique_ptr<xmlSchema, SchemaFree> xsd(parser ? xmlSchemaParse(parser.get()) : nullptr);
  if (!xsd)
    throw InputError(
        fmt::format("{} \"{}\" could not be loaded offline ({}); use the copy whose import of D-SI "
                    "points at a local SI_Format-2.1.0.xsd.",
                    schema_field, schema.string(), errors.first()));
  std::unique_ptr<xmlSchemaValidCtxt, ValidFree> valid(xmlSchemaNewValidCtxt(xsd.get()));
  if (!valid) throw StorageError("libxml2 could not create a schema validation context.");
  const int result = xmlSchemaValidateDoc(valid.get(), doc);
  if (result == 0) return std::nullopt;
  return errors.first().empty() ? fmt::format("libxml2 validation code {}", result) : errors.first();
}

}  // namespace plumb::report::dcc
