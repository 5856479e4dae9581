#include "report/certificates/document.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "checks/procedure.hpp"
#include "report/certificates/trail_checkpoint_note.hpp"
#include "report/history/charts.hpp"

#include "report/certificates/status_text.hpp"
#include "report/format/text.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

KeyValues instrument_block(const json& inst) {
  KeyValues kv;
  const std::pair<const char*, const char*> fields[] = {{"id", "Instrument"},
                                                        {"kind", "Kind"},
                                                        {"maker", "Maker"},
                                                        {"model", "Model"},
                                                        {"serial", "Serial number"},
                                                        {"asset_tag", "Asset tag"},
                                                        {"location", "Location"},
                                                        {"capacity_g", "Capacity (g)"},
                                                        {"readability_g", "Readability d (g)"},
                                                        {"smallest_net_g", "Smallest net weight (g)"},
                                                        {"check_every", "Check interval"},
                                                        {"volume_kind", "Volume"},
                                                        {"nominal_ul", "Nominal volume (uL)"},
                                                        {"lower_limit_ul", "Lowest selectable volume (uL)"},
                                                        {"channels", "Channels"},
                                                        {"limits_policy", "Limits policy"},
                                                        {"limits", "Limits"},
                                                        {"limits_source", "Limits source"}};
  for (const auto& [key, label] : fields)
    if (inst.contains(key) && !inst[key].is_null() && !cell(inst, key).empty())
      kv.rows.emplace_back(label, cell(inst, key));
  // Fields other kinds add (model, serial, volume ...) follow, so nothing stored is left off the page.
  for (const auto& item : inst.items()) {
    const std::string& k = item.key();
    const auto& v = item.value();
    const bool known = std::any_of(std::begin(fields), std::end(fields), [&](const auto& f) { return k == f.first; });
    if (!known && !v.is_null() && !v.is_structured()) kv.rows.emplace_back(k, cell(inst, k.c_str()));
  }
  return kv;
}

// Any kind without its own sections: the stored check results, scalar fields only.
void generic_sections(const json& c, Document& doc) {
  if (!c.contains("check") || !c["check"].is_object()) return;
  doc.blocks.push_back(Heading{"Results"});
  KeyValues kv;
  for (const auto& [k, v] : c["check"].items())
    if (!v.is_null() && !v.is_structured()) kv.rows.emplace_back(k, cell(c["check"], k.c_str()));
  doc.blocks.push_back(std::move(kv));
}

}  // namespace

std::string cell(const json& j, const char* key, int significant) {
  if (!j.is_object() || !j.contains(key) || j[key].is_null()) return "-";
  const json& v = j[key];
  if (v.is_string()) return v.get<std::string>();
  if (v.is_boolean()) return v.get<bool>() ? "yes" : "no";
  if (v.is_number_integer()) return std::to_string(v.get<long long>());
  if (v.is_number()) return fmt::format("{:.{}g}", v.get<double>(), significant);
  return v.dump();
}

void kind_sections(const json& c, Document& doc) {
  const auto procedure = checks::procedure_of_certificate_kind(c.value("kind", ""));
  if (!procedure) return generic_sections(c, doc);
  switch (*procedure) {
    case checks::Procedure::repeatability:
      return balance_check_sections(c, doc);
    case checks::Procedure::calibration:
      return balance_calibration_sections(c, doc);
    case checks::Procedure::gravimetric:
      return pipette_check_sections(c, doc);
  }
}

namespace {

std::string watermark_of(const std::string& state) {
  if (state == "withdrawn") return "WITHDRAWN";
  if (state == "superseded") return "SUPERSEDED";
  if (state == "approved") return "";
  return "DRAFT";
}

// ISO/IEC 17025 7.8.2.1: what identifies the certificate, its standing today and, for an amendment, what it
// replaces and why (7.8.8).
void certificate_block(const json& c, const json& status, Document& doc) {
  KeyValues kv{{{"Certificate No.", cell(c, "number")},
                {"Status", certificate_status_line(status)},
                {"Date of issue", cell(c, "issued_at")},
                {"Issued by", cell(c, "issued_by")}}};
  kv.rows.emplace_back("Customer", c.contains("customer") ? cell(c, "customer")
                                                          : cell(c.value("lab", json::object()), "name") +
                                                                " (the laboratory's own instrument)");
  if (c.contains("replaces") && c["replaces"].is_object())
    kv.rows.emplace_back("Amendment", fmt::format("this certificate replaces certificate {} (check run {}); reason: {}",
                                                  cell(c["replaces"], "number"), cell(c["replaces"], "run_id"),
                                                  cell(c["replaces"], "reason")));
  doc.blocks.push_back(Heading{"Certificate"});
  doc.blocks.push_back(std::move(kv));
}

// Who performed the check and who authorised the certificate (7.8.2.1 o): name, function and, when signed in
// plumb, the signature's meaning and UTC time; otherwise lines to sign by hand.
Signatures signatures_of(const json& c, const json& status) {
  Signatures s;
  const json& approval = status.value("approval", json());
  for (const auto& p : c.value("signatories", json::array())) {
    Signatory who{cell(p, "role"), p.value("name", ""), p.value("function", ""), "", ""};
    if (who.role == "-") who.role = "";
    const bool reviewer = who.role.find("eview") != std::string::npos || who.role.find("pprov") != std::string::npos;
    if (reviewer && approval.is_object()) {
      who.role = "Reviewed and approved by";
      who.name = approval.value("by", "");
      who.function = approval.value("function", "reviewer");
      who.meaning = approval.value("meaning", "");
      who.signed_at = approval.value("at", "");
    } else if (!reviewer && who.function.empty()) {
      who.function = "operator who performed the check";
    }
    s.people.push_back(std::move(who));
  }
  if (approval.is_object() &&
      std::none_of(s.people.begin(), s.people.end(), [](const Signatory& p) { return !p.signed_at.empty(); }))
    s.people.push_back({"Reviewed and approved by", approval.value("by", ""), approval.value("function", "reviewer"),
                        approval.value("meaning", ""), approval.value("at", "")});
  // The electronic signatures (21 CFR 11.50): printed name, function, meaning and UTC time of each; the approval
  // shown above is one of them, and then its line takes the signer's function.
  for (const auto& sig : status.value("signatures", json::array())) {
    Signatory signed_by{"Signed electronically by", sig.value("name", ""), sig.value("function", ""),
                        sig.value("meaning", ""), sig.value("at", "")};
    const auto same = std::find_if(s.people.begin(), s.people.end(), [&](const Signatory& p) {
      return p.name == signed_by.name && p.signed_at == signed_by.signed_at;
    });
    if (same == s.people.end())
      s.people.push_back(std::move(signed_by));
    else if (!signed_by.function.empty())
      same->function = signed_by.function;
  }
  return s;
}

}  // namespace

Document certificate_document(const json& shown) {
  const json& c = shown;
  // Certificates issued before 2026-12 kept the instrument's service status under "status" in their content.
  const json status =
      shown.contains("status") && shown["status"].is_object() ? shown["status"] : json{{"state", "draft"}};
  Document doc;
  const json& lab = c.value("lab", json::object());
  auto& h = doc.header;
  h.lab_name = lab.value("name", "");
  for (const auto& l : lab.value("address_lines", json::array())) h.address_lines.push_back(l.get<std::string>());
  h.accreditation = lab.value("accreditation", "");
  h.logo_png = lab.value("logo_png", "");
  h.title = c.value("title", "Certificate");
  h.number = c.value("number", "");
  h.status = certificate_status_summary(status);
  h.watermark = watermark_of(status.value("state", "draft"));
  h.issued = fmt::format("Issued {} by {}", cell(c, "issued_at"), cell(c, "issued_by"));

  certificate_block(c, status, doc);
  doc.blocks.push_back(Heading{"Instrument"});
  doc.blocks.push_back(instrument_block(c.value("instrument", json::object())));

  kind_sections(c, doc);

  doc.blocks.push_back(Heading{"Statement of conformity"});
  const std::string verdict = c.value("verdict", "");
  const bool pass = verdict == "pass";
  doc.blocks.push_back(VerdictBox{
      "VERDICT: " + upper_case(verdict.empty() ? "none" : verdict),
      pass ? fmt::format("Next {} due: {}", c.value("kind", "") == "balance_calibration" ? "calibration" : "check",
                         cell(c, "next_due"))
           : "The instrument is OUT OF SERVICE until a passing check.",
      pass});
  if (c.contains("decision_rule")) doc.blocks.push_back(Paragraph{"Decision rule: " + cell(c, "decision_rule")});
  if (c.contains("uncertainty_statement"))
    doc.blocks.push_back(Paragraph{"Uncertainty: " + cell(c, "uncertainty_statement")});
  doc.blocks.push_back(
      Paragraph{"The results relate only to the item identified above, as received, at the time and "
                "under the conditions stated. This certificate shall not be reproduced except in "
                "full without the laboratory's approval."});

  doc.blocks.push_back(Heading{"Signatures"});
  doc.blocks.push_back(signatures_of(c, status));
  if (c.contains("caution") && !cell(c, "caution").empty() && cell(c, "caution") != "-")
    doc.blocks.push_back(Paragraph{"Caution: " + cell(c, "caution"), false, true});
  doc.footer = "Content SHA-256 " + cell(c, "content_sha256") + trail_checkpoint_note(c) +
               ". This is a rendering of the stored certificate; the stored record is authoritative.";
  return doc;
}

namespace {

// The stored history names its quantity; an SD, a CV or a minimum weight cannot be negative (the same keys as
// app/history/quantities, read back from the stored record).
bool non_negative_quantity(const json& h) {
  const std::string key = h.value("quantity", "");
  return h.value("non_negative", false) || key == "sd" || key == "min-weight" || key.rfind("cv", 0) == 0;
}

}  // namespace

void history_chart_section(const json& c, Document& doc) {
  if (!c.contains("history") || !c["history"].is_object()) return;
  const json& h = c["history"];
  std::vector<stats::Observation> points;
  HistoryChartMarks marks;
  for (const auto& p : h.value("points", json::array())) {
    points.push_back({parse_date(p.at("date").get<std::string>()), p.at("value").get<double>(), p.value("u", 0.0)});
    marks.outcomes.push_back(p.value("failed", false) ? ChartPoint::Outcome::failed : ChartPoint::Outcome::pass);
  }
  if (points.size() < 2) return;  // one point tells no history
  stats::ToleranceLimits tol;
  if (h.contains("lower") && h["lower"].is_number()) tol.lower = h["lower"].get<double>();
  if (h.contains("upper") && h["upper"].is_number()) tol.upper = h["upper"].get<double>();
  const std::string instrument = c.value("instrument", json::object()).value("id", "");
  ChartSpec spec =
      history_chart_spec(points, {}, tol,
                         {fmt::format("{} {}", c.value("instrument", json::object()).value("kind", ""), instrument),
                          h.value("label", ""), h.value("unit", ""), non_negative_quantity(h)},
                         marks);
  spec.title = fmt::format("Recent history of {}: {}", instrument, h.value("label", ""));
  spec.notes = {"Error bars: " + h.value("uncertainty_basis", "") + ".",
                "Tolerance: " + h.value("tolerance_basis", "") + "."};
  spec.width = 720;
  spec.height = 380;
  doc.blocks.push_back(Heading{"Recent history"});
  doc.blocks.push_back(ChartBlock{std::move(spec)});
}

}  // namespace plumb::report
