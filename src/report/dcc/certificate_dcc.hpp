#pragma once
// A stored certificate document (app::certificate_document: the stored content plus its status today) as
// a Digital Calibration Certificate, DCC 3.1.2 with D-SI 2.1.0 (PTB's schemas). A rendering like the text
// and the PDF: it reads the stored results and writes them, it never recomputes one. Which element carries
// which part of the certificate is listed in doc/dcc.md.
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::report::dcc {

struct DccOptions {
  std::string country_code;      ///< ISO 3166-1 alpha-2 code of the laboratory's country ("DE")
  std::string software_release;  ///< plumb's version, for dcc:dccSoftware
};

/// The DCC as UTF-8 XML text. StorageError when the document is of a kind without a DCC rendering or
/// holds a value a DCC cannot carry; InputError for a country code that is not two capital letters.
std::string certificate_dcc(const nlohmann::json& document, const DccOptions& options);

}  // namespace plumb::report::dcc
