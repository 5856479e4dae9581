#pragma once
// A stored certificate (its JSON document) as a Document for the PDF renderer. The parts every
// certificate has (lab header, number and status, instrument, verdict, decision rule, signatures,
// caution, content hash) are built here; the sections in between come from the certificate's kind.
//
// Each procedure's sections live in report/<procedure domain>/certificate_sections.cpp and are chosen by a
// switch over the procedure registry (checks/procedure.hpp) in certificates/document.cpp. A certificate of a
// kind the registry does not know still renders: its check results are listed as key-value pairs.
#include <nlohmann/json.hpp>
#include <string>

#include "report/document/document.hpp"

namespace plumb::report {

Document certificate_document(const nlohmann::json& certificate, const std::string& content_sha256);

// Section builders of the kinds plumb issues, and helpers they share.
void balance_check_sections(const nlohmann::json& certificate, Document& doc);
void balance_calibration_sections(const nlohmann::json& certificate, Document& doc);
void pipette_check_sections(const nlohmann::json& certificate, Document& doc);
/// The recent history chart stored with a certificate ("history"), if any.
void history_chart_section(const nlohmann::json& certificate, Document& doc);
/// A JSON value as certificate text: strings as they are, numbers with up to `significant` digits, "-" for null.
std::string cell(const nlohmann::json& j, const char* key, int significant = 6);

}  // namespace plumb::report
