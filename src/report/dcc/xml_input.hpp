#pragma once
// XML from outside (a DCC a calibration provider sent) is untrusted input: it is parsed by libxml2 with no
// network access (XML_PARSE_NONET), without substituting entities or loading a DTD (no XML_PARSE_NOENT,
// no XML_PARSE_DTDLOAD), and a document that declares a DOCTYPE at all is refused, so an external entity
// (XXE) can never be read. Schemas are loaded with libxml2's no-network entity loader, and validation is
// libxml2's own (xmlSchemaValidateDoc).
#include <filesystem>
#include <optional>
#include <string>
#include <string_view>

#include "report/dcc/xml_tree.hpp"

namespace plumb::report::dcc {

/// Larger files are refused before parsing: a DCC of one weight is a few kilobytes.
inline constexpr std::size_t max_xml_bytes = std::size_t{4} * 1024 * 1024;

/// Parses `text` as untrusted XML. InputError naming `field` (e.g. "--from-dcc cert.xml") and the line at
/// fault: not well-formed, a DOCTYPE, or too large.
XmlDoc parse_untrusted_xml(std::string_view text, std::string_view field);
/// Reads and parses the file `path` the same way.
XmlDoc read_untrusted_xml(const std::filesystem::path& path, std::string_view field);

/// The first way `doc` breaks the XSD at `schema` ("line 12: Element '{https://ptb.de/si}value': ..."), or
/// nullopt when it validates. InputError naming `schema_field` when the schema cannot be loaded offline.
std::optional<std::string> schema_violation(xmlDoc* doc, const std::filesystem::path& schema,
                                            std::string_view schema_field);

}  // namespace plumb::report::dcc
