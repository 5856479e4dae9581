#pragma once
// A stored certificate (its JSON document) as a Document for the PDF renderer. The parts every
// certificate has (lab header, number and status, instrument, verdict, decision rule, signatures,
// caution, content hash) are built here; the sections in between come from the certificate's kind.
//
// To add a kind (balance calibration, pipette ...): write `void NAME_sections(const json&, Document&)`
// in its own certificate_<kind>.cpp and add one line to certificate_sections() in certificate_document.cpp.
// A kind without sections still renders: its check results are listed as key-value pairs.
#include <functional>
#include <map>
#include <nlohmann/json.hpp>
#include <string>

#include "report/document/document.hpp"

namespace plumb::report {

using CertificateSections = std::function<void(const nlohmann::json& certificate, Document& doc)>;

/// Kind -> the sections between the instrument and the verdict.
const std::map<std::string, CertificateSections>& certificate_sections();

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
