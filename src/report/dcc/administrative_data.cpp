// dcc:administrativeData of every certificate: who made it, for which item, by whom, for whom, and the
// statements (standing, conformity, decision rule, due date, cautions) an ISO/IEC 17025 7.8 certificate
// carries. See doc/dcc.md for the mapping.
#include <fmt/format.h>

#include <cctype>
#include <vector>

#include "core/errors.hpp"
#include "report/dcc/parts.hpp"
#include "report/dcc/xml_tree.hpp"

namespace plumb::report::dcc {
namespace {

using nlohmann::json;

std::string text_of(const json& j, const char* key) {
  const auto it = j.find(key);
  if (it == j.end() || it->is_null()) return {};
  return it->is_string() ? it->get<std::string>() : it->dump();
}

void add_software(xmlNodePtr admin, const DccOptions& options) {
  xmlNodePtr list = add(admin, "dccSoftware");
  xmlNodePtr s = add(list, "software");
  add_text(s, "name", "plumb");
  add(s, "release", options.software_release);
  add(s, "type", "application");
}

void add_core_data(xmlNodePtr admin, const json& doc, const DccOptions& options) {
  xmlNodePtr core = add(admin, "coreData");
  add(core, "countryCodeISO3166_1", options.country_code);
  add(core, "usedLangCodeISO639_1", "en");
  add(core, "mandatoryLangCodeISO639_1", "en");
  add(core, "uniqueIdentifier", text_of(doc, "number"));
  // The hash of the stored content ties this rendering to the one stored record it renders.
  xmlNodePtr ids = add(core, "identifications");
  xmlNodePtr id = add(ids, "identification");
  add(id, "issuer", "calibrationLaboratory");
  add(id, "value", text_of(doc, "content_sha256"));
  add_text(id, "name", "SHA-256 of the stored certificate content");
  const std::string date = text_of(doc["check"], "date");
  add(core, "beginPerformanceDate", date);
  add(core, "endPerformanceDate", date);
  add(core, "performanceLocation", "laboratory");
}

void add_identification(xmlNodePtr ids, const char* issuer, const std::string& value, const char* name) {
  if (value.empty()) return;
  xmlNodePtr id = add(ids, "identification");
  add(id, "issuer", issuer);
  add(id, "value", value);
  add_text(id, "name", name);
}

void add_item(xmlNodePtr admin, const json& doc) {
  const json& ins = doc["instrument"];
  const std::string kind = text_of(ins, "kind");
  xmlNodePtr items = add(admin, "items");
  xmlNodePtr item = add(items, "item");
  const bool pipette = kind == "pipette";
  add_text(item, "name", fmt::format("{} {}", pipette ? "Pipette" : "Balance", text_of(ins, "id")));
  std::string description =
      pipette ? fmt::format("{} piston pipette, nominal volume {} uL, {} channel(s)", text_of(ins, "volume_kind"),
                            text_of(ins, "nominal_ul"), text_of(ins, "channels"))
              : fmt::format("non-automatic weighing instrument, capacity {} g, readability d = {} g",
                            text_of(ins, "capacity_g"), text_of(ins, "readability_g"));
  if (!text_of(ins, "location").empty()) description += fmt::format("; location: {}", text_of(ins, "location"));
  add_text(item, "description", description);
  xmlNodePtr maker = add(item, "manufacturer");
  const std::string maker_name = text_of(ins, "maker");
  add_text(maker, "name", maker_name.empty() ? "not recorded" : maker_name);
  if (!text_of(ins, "model").empty()) add(item, "model", text_of(ins, "model"));
  xmlNodePtr ids = add(item, "identifications");
  add_identification(ids, "customer", text_of(ins, "id"), "instrument id in the laboratory's register");
  add_identification(ids, "manufacturer", text_of(ins, "serial"), "serial number");
  add_identification(ids, "owner", text_of(ins, "asset_tag"), "asset tag");
}

/// The laboratory as a dcc:contactType. plumb records no e-mail address, so dcc:eMail (required) is empty.
void add_lab_contact(xmlNodePtr parent, const json& lab, const DccOptions& options) {
  add_text(parent, "name", text_of(lab, "name"));
  add(parent, "eMail", "");
  xmlNodePtr location = add(parent, "location");
  for (const auto& line : lab.value("address_lines", json::array()))
    if (line.is_string()) add_text(location, "further", line.get<std::string>());
  add(location, "countryCode", options.country_code);
}

void add_lab(xmlNodePtr admin, const json& doc, const DccOptions& options) {
  xmlNodePtr lab = add(admin, "calibrationLaboratory");
  const std::string accreditation = text_of(doc["lab"], "accreditation");
  if (!accreditation.empty()) add(lab, "calibrationLaboratoryCode", accreditation);
  add_lab_contact(add(lab, "contact"), doc["lab"], options);
}

void add_person(xmlNodePtr list, const std::string& name, const std::string& description, const std::string& role,
                bool main_signer) {
  xmlNodePtr p = add(list, "respPerson");
  add_text(add(p, "person"), "name", name);
  add_text(p, "description", description);
  add(p, "role", role);
  add(p, "mainSigner", main_signer ? "true" : "false");
}

void add_responsible_persons(xmlNodePtr admin, const json& doc) {
  xmlNodePtr list = add(admin, "respPersons");
  const json& approval = doc["status"]["approval"];
  const std::string operator_name = text_of(doc["check"], "operator");
  if (!operator_name.empty())
    add_person(list, operator_name, fmt::format("performed the check on {}", text_of(doc["check"], "date")),
               "performed by", false);
  add_person(list, text_of(doc, "issued_by"), fmt::format("issued the certificate at {}", text_of(doc, "issued_at")),
             "issued by", approval.is_null());
  if (!approval.is_null())
    add_person(list, text_of(approval, "by"),
               fmt::format("electronic signature recorded at {}; meaning of the signature: {}", text_of(approval, "at"),
                           text_of(approval, "meaning")),
               "approved by", true);
}

xmlNodePtr add_statement(xmlNodePtr statements, const char* ref_type, const std::vector<std::string>& norms,
                         const std::string& declaration, bool traceable = false) {
  xmlNodePtr s = add(statements, "statement");
  set_attribute(s, "refType", ref_type);
  if (traceable) add(s, "traceable", "true");  // before dcc:norm in statementMetaDataType
  for (const auto& n : norms) add(s, "norm", n);
  add_text(s, "declaration", declaration);
  return s;
}

/// The certificate's standing today: a draft, superseded or withdrawn certificate says so, and is not valid.
void add_standing(xmlNodePtr statements, const json& status) {
  const std::string state = text_of(status, "state");
  std::string declaration;
  if (state == "approved") {
    declaration = fmt::format("APPROVED by {} at {} ({}).", text_of(status["approval"], "by"),
                              text_of(status["approval"], "at"), text_of(status["approval"], "meaning"));
  } else if (state == "superseded") {
    const json& s = status["superseded"];
    declaration = fmt::format("SUPERSEDED by certificate {} at {} ({}): this certificate is no longer valid.",
                              text_of(s, "by_certificate"), text_of(s, "at"), text_of(s, "reason"));
  } else if (state == "withdrawn") {
    const json& w = status["withdrawn"];
    declaration = fmt::format("WITHDRAWN by {} at {} ({}): this certificate is not valid.", text_of(w, "by"),
                              text_of(w, "at"), text_of(w, "reason"));
  } else {
    declaration = "DRAFT: this certificate has not been approved and is not valid until it is.";
  }
  xmlNodePtr s = add_statement(statements, "plumb_certificateStatus", {}, declaration);
  add(s, "valid", state == "approved" ? "true" : "false");
}

std::string conformity_key(const json& doc) {
  if (doc.contains("calibration")) return text_of(doc["calibration"], "final_state");
  return text_of(doc, "verdict");
}

void add_statements(xmlNodePtr admin, const json& doc) {
  xmlNodePtr statements = add(admin, "statements");
  add_standing(statements, doc["status"]);
  if (doc.contains("replaces") && doc["replaces"].is_object())
    add_statement(statements, "plumb_replaces", {},
                  fmt::format("This certificate replaces certificate {} (reason: {}).",
                              text_of(doc["replaces"], "number"), text_of(doc["replaces"], "reason")));

  const std::string key = conformity_key(doc);
  std::string upper = key;
  for (char& c : upper) c = static_cast<char>(std::toupper(static_cast<unsigned char>(c)));
  xmlNodePtr conformity =
      add_statement(statements, "plumb_conformity", {"ILAC G8:09/2019"},
                    fmt::format("Statement of conformity: {} under the decision rule stated.", upper));
  add(conformity, "conformity", dcc_conformity(key));

  std::string rule = text_of(doc, "decision_rule");
  if (doc.contains("calibration"))
    rule = text_of(doc["calibration"]["decision_rule"], "statement");
  else
    rule = fmt::format("Decision rule: {}.", rule);
  add_statement(statements, "plumb_decisionRule", {"ILAC G8:09/2019"}, rule);
  if (doc.contains("uncertainty_statement"))
    add_statement(statements, "plumb_uncertainty", {"JCGM 100:2008 (GUM)"}, text_of(doc, "uncertainty_statement"));

  if (!doc["weights"].empty())
    add_statement(statements, "plumb_traceability", {},
                  "Metrological traceability: through the reference weights listed with the measurement results, "
                  "each with its own calibration certificate.",
                  true);
  add_statement(statements, "plumb_scope", {},
                "The results relate only to the item calibrated, under the conditions stated.");
  if (!text_of(doc, "next_due").empty()) {
    xmlNodePtr due = add_statement(statements, "plumb_dueDate", {},
                                   "Next check or calibration due (the laboratory's interval for this instrument).");
    add(due, "date", text_of(doc, "next_due"));
  }
  if (!text_of(doc, "caution").empty()) add_statement(statements, "plumb_caution", {}, text_of(doc, "caution"));
}

void check_country(const std::string& code) {
  const bool two_capitals = code.size() == 2 && std::isupper(static_cast<unsigned char>(code[0])) &&
                            std::isupper(static_cast<unsigned char>(code[1]));
  if (!two_capitals)
    throw InputError(fmt::format("--country \"{}\" is not an ISO 3166-1 two-letter country code such as DE.", code));
}

}  // namespace

void add_administrative_data(xmlNodePtr root, const json& doc, const DccOptions& options) {
  check_country(options.country_code);
  xmlNodePtr admin = add(root, "administrativeData");
  add_software(admin, options);
  add_core_data(admin, doc, options);
  add_item(admin, doc);
  add_lab(admin, doc, options);
  add_responsible_persons(admin, doc);
  // The customer is the laboratory itself: plumb records a lab's own instruments.
  add_lab_contact(add(admin, "customer"), doc["lab"], options);
  add_statements(admin, doc);
}

}  // namespace plumb::report::dcc
