#pragma once
// A stored certificate (its JSON document and its standing today) as the one Document every rendering draws:
// PDF, text, HTML and the JSON list of labelled values. The parts every certificate has (lab header, number,
// status and mark, the certificate's identification and amendment, customer, instrument, verdict, decision rule,
// the statement that results relate only to the item, signatures, caution, content hash) are built here; the
// sections in between come from the certificate's kind. doc/certificates.md maps each ISO/IEC 17025 7.8 item
// to the field that carries it.
//
// Each procedure's sections live in report/<procedure domain>/certificate_sections.cpp and are chosen by a
// switch over the procedure registry (checks/procedure.hpp) in certificates/document.cpp. A certificate of a
// kind the registry does not know still renders: its check results are listed as key-value pairs.
#include <nlohmann/json.hpp>
#include <string>

#include "report/document/document.hpp"

namespace plumb::report {

/// `shown` is the stored content with "content_sha256" and "status" beside it (app::certificate_document); without a
/// "status" the certificate is drawn as the draft it is when issued.
Document certificate_document(const nlohmann::json& shown);

// Section builders of the kinds plumb issues, and helpers they share.
void balance_check_sections(const nlohmann::json& certificate, Document& doc);
void balance_calibration_sections(const nlohmann::json& certificate, Document& doc);
void pipette_check_sections(const nlohmann::json& certificate, Document& doc);
/// The recent history chart stored with a certificate ("history"), if any.
void history_chart_section(const nlohmann::json& certificate, Document& doc);
/// A JSON value as certificate text: strings as they are, numbers with up to `significant` digits, "-" for null.
std::string cell(const nlohmann::json& j, const char* key, int significant = 6);

}  // namespace plumb::report
