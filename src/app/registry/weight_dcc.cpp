#include "app/registry/weight_dcc.hpp"

#include <fmt/format.h>
#include <libxml/xpath.h>
#include <libxml/xpathInternals.h>

#include <algorithm>
#include <cctype>
#include <memory>
#include <vector>

#include "core/errors.hpp"
#include "report/dcc/quantity.hpp"
#include "report/dcc/units.hpp"
#include "report/dcc/xml_input.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

namespace dcc = report::dcc;

struct XPathContextFree {
  void operator()(xmlXPathContext* c) const { xmlXPathFreeContext(c); }
};
struct XPathObjectFree {
  void operator()(xmlXPathObject* o) const { xmlXPathFreeObject(o); }
};

std::string lowercase_of(std::string s) {
  std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  return s;
}

std::string without_blanks_around(std::string s) {
  const auto b = s.find_first_not_of(" \t\r\n");
  if (b == std::string::npos) return {};
  return s.substr(b, s.find_last_not_of(" \t\r\n") - b + 1);
}

/// XPath over one DCC with the dcc and si prefixes bound.
class DccReader {
 public:
  explicit DccReader(xmlDoc* doc) : ctx_(xmlXPathNewContext(doc)) {
    if (!ctx_) throw StorageError("libxml2 could not create an XPath context.");
    xmlXPathRegisterNs(ctx_.get(), reinterpret_cast<const xmlChar*>("dcc"),
                       reinterpret_cast<const xmlChar*>(dcc::dcc_namespace));
    xmlXPathRegisterNs(ctx_.get(), reinterpret_cast<const xmlChar*>("si"),
                       reinterpret_cast<const xmlChar*>(dcc::si_namespace));
  }

  /// The elements `path` selects below `from` (the document when null).
  std::vector<xmlNodePtr> nodes(const char* path, xmlNodePtr from = nullptr) {
    ctx_->node = from ? from : xmlDocGetRootElement(ctx_->doc);
    std::unique_ptr<xmlXPathObject, XPathObjectFree> r(
        xmlXPathEvalExpression(reinterpret_cast<const xmlChar*>(path), ctx_.get()));
    std::vector<xmlNodePtr> out;
    if (r && r->nodesetval)
      for (int i = 0; i < r->nodesetval->nodeNr; ++i) out.push_back(r->nodesetval->nodeTab[i]);
    return out;
  }

  /// The text of the first element `path` selects, trimmed; empty when none.
  std::string text(const char* path, xmlNodePtr from = nullptr) {
    const auto found = nodes(path, from);
    return found.empty() ? std::string() : content(found[0]);
  }

  static std::string content(xmlNodePtr n) {
    xmlChar* c = xmlNodeGetContent(n);
    std::string s = c ? reinterpret_cast<const char*>(c) : "";
    xmlFree(c);
    return without_blanks_around(s);
  }

  static std::string attribute(xmlNodePtr n, const char* name) {
    xmlChar* a = xmlGetProp(n, reinterpret_cast<const xmlChar*>(name));
    std::string s = a ? reinterpret_cast<const char*>(a) : "";
    xmlFree(a);
    return s;
  }

 private:
  std::unique_ptr<xmlXPathContext, XPathContextFree> ctx_;
};

/// An xs:date as a calendar date: "2027-02-18Z" and "2027-02-18+01:00" (a time zone is allowed there) are the
/// day 2027-02-18 for a certificate.
std::string calendar_date(const std::string& xs_date) {
  if (xs_date.size() <= 10) return xs_date;
  const std::string zone = xs_date.substr(10);
  const bool is_zone = zone == "Z" || (zone.size() == 6 && (zone[0] == '+' || zone[0] == '-') && zone[3] == ':');
  return is_zone ? xs_date.substr(0, 10) : xs_date;
}

/// What a mass quantity of the DCC is, from its refType and its name (providers name them differently).
enum class MassKind { correction, conventional, nominal, true_mass, other };

MassKind kind_of(const std::string& ref_type, const std::string& name) {
  const std::string words = lowercase_of(ref_type + " " + name);
  if (words.find("correction") != std::string::npos) return MassKind::correction;
  if (words.find("conventional") != std::string::npos) return MassKind::conventional;
  if (words.find("nominal") != std::string::npos) return MassKind::nominal;
  if (words.find("mass") != std::string::npos) return MassKind::true_mass;
  return MassKind::other;
}

struct MassQuantity {
  std::string name;
  ExactMass value;
  std::optional<ExactMass> uncertainty;
  std::string k;
  long line = 0;
};

/// An si:real of mass: its value (and U) in grams, exactly.
MassQuantity read_mass(DccReader& r, xmlNodePtr quantity, const std::string& name, const std::string& field) {
  MassQuantity m;
  m.name = name;
  m.line = xmlGetLineNo(quantity);
  const std::string unit_text = r.text("si:real/si:unit", quantity);
  const auto unit = dcc::find_dsi_unit(unit_text);
  if (!unit || unit->dimension != dcc::Dimension::mass)
    throw InputError(
        fmt::format("{} line {}: the unit \"{}\" of \"{}\" is not a D-SI unit of mass (\\gram, "
                    "\\milli\\gram, \\kilogram ...).",
                    field, m.line, unit_text, name));
  const auto exact = [&](const std::string& text, const char* what) {
    const auto plain = dcc::plain_decimal(text);
    if (!plain)
      throw InputError(
          fmt::format("{} line {}: the {} \"{}\" of \"{}\" is not a number.", field, m.line, what, text, name));
    return ExactMass::grams(Decimal::parse(*plain, field).shifted(unit->exponent_to_base));
  };
  m.value = exact(r.text("si:real/si:value", quantity), "value");
  const std::string u = r.text("si:real/si:expandedUnc/si:uncertainty", quantity);
  if (!u.empty()) {
    m.uncertainty = exact(u, "expanded uncertainty");
    m.k = r.text("si:real/si:expandedUnc/si:coverageFactor", quantity);
  }
  return m;
}

/// The weight's identity among the item's identifications; refuses a DCC of several items or of another weight.
void require_this_weight(DccReader& r, const store::WeightRecord& weight, const std::string& field) {
  const auto items = r.nodes("/dcc:digitalCalibrationCertificate/dcc:administrativeData/dcc:items/dcc:item");
  if (items.size() != 1)
    throw InputError(
        fmt::format("{} certifies {} items; plumb reads the certificate of one weight.", field, items.size()));
  std::vector<std::string> named;
  for (xmlNodePtr v : r.nodes("dcc:identifications/dcc:identification/dcc:value", items[0]))
    named.push_back(DccReader::content(v));
  for (const auto& n : named)
    if (n == weight.id) return;
  std::string list;
  for (const auto& n : named) list += (list.empty() ? "" : ", ") + n;
  throw InputError(
      fmt::format("{} line {}: the item is identified as {}, not as weight {}; this is another "
                  "weight's certificate.",
                  field, xmlGetLineNo(items[0]), list.empty() ? "nothing" : list, weight.id));
}

/// A due date the provider states: a statement with a dcc:date whose refType or declaration speaks of
/// recalibration or a due date.
std::string stated_due_date(DccReader& r) {
  for (xmlNodePtr s : r.nodes("//dcc:administrativeData/dcc:statements/dcc:statement[dcc:date]")) {
    const std::string words = lowercase_of(DccReader::attribute(s, "refType") + " " + r.text("dcc:declaration", s));
    if (words.find("recalibrat") != std::string::npos || words.find("due") != std::string::npos)
      return calendar_date(r.text("dcc:date", s));
  }
  return {};
}

}  // namespace

WeightCertificateInput weight_certificate_from_dcc(const store::WeightRecord& weight, const WeightDccInput& in) {
  const std::string field = fmt::format("--from-dcc {}", in.file);
  const dcc::XmlDoc doc = dcc::read_untrusted_xml(in.file, field);
  if (const auto violation = dcc::schema_violation(doc.get(), in.schema, "--dcc-schema"))
    throw InputError(fmt::format("{} does not validate against the DCC 3.1.2 schema ({}).", field, *violation));
  DccReader r(doc.get());
  require_this_weight(r, weight, field);

  std::optional<MassQuantity> correction, conventional, nominal, true_mass;
  for (xmlNodePtr q : r.nodes("//dcc:measurementResults//dcc:quantity[si:real]")) {
    const std::string name = r.text("dcc:name/dcc:content", q);
    const auto kind = kind_of(DccReader::attribute(q, "refType"), name);
    auto* slot = kind == MassKind::correction     ? &correction
                 : kind == MassKind::conventional ? &conventional
                 : kind == MassKind::nominal      ? &nominal
                 : kind == MassKind::true_mass    ? &true_mass
                                                  : nullptr;
    if (!slot) continue;
    if (*slot)
      throw InputError(
          fmt::format("{} line {}: \"{}\" is a second result of its kind (the first is \"{}\" on line "
                      "{}); plumb reads the certificate of one weight.",
                      field, xmlGetLineNo(q), name, (*slot)->name, (*slot)->line));
    *slot = read_mass(r, q, name, field);
  }
  if (nominal && nominal->value != weight.nominal)
    throw InputError(
        fmt::format("{} line {}: the nominal value {} is not that of weight {} ({}); this is another "
                    "weight's certificate.",
                    field, nominal->line, nominal->value.to_string(), weight.id, weight.nominal.to_string()));
  const MassQuantity* result = correction ? &*correction : conventional ? &*conventional : nullptr;
  if (!result)
    throw InputError(
        fmt::format("{} gives no conventional mass and no correction of it{}; plumb records the "
                    "conventional mass (OIML D 28).",
                    field, true_mass ? fmt::format(" (only \"{}\")", true_mass->name) : ""));
  if (!result->uncertainty)
    throw InputError(
        fmt::format("{} line {}: \"{}\" has no si:expandedUnc; the expanded uncertainty U and its "
                    "coverage factor are needed.",
                    field, result->line, result->name));

  WeightCertificateInput out;
  out.certificate =
      r.text("/dcc:digitalCalibrationCertificate/dcc:administrativeData/dcc:coreData/dcc:uniqueIdentifier");
  const ExactMass c = correction ? correction->value : conventional->value - weight.nominal;
  out.correction = c.in_grams().to_string() + "g";
  out.uncertainty = result->uncertainty->in_grams().to_string() + "g";
  out.k = result->k;
  out.calibrated = calendar_date(
      r.text("/dcc:digitalCalibrationCertificate/dcc:administrativeData/dcc:coreData/dcc:endPerformanceDate"));
  const std::string due = stated_due_date(r);
  if (in.due)
    out.due = *in.due;
  else if (!due.empty())
    out.due = due;
  else
    throw InputError(fmt::format("{} states no recalibration due date; give it with --due YYYY-MM-DD.", field));
  out.override_reason = in.override_reason;
  return out;
}

RecalibrationOutcome recalibrate_weight_from_dcc(store::Database& db, const store::Actor& actor, const std::string& id,
                                                 const WeightDccInput& in) {
  const auto weight = store::find_weight(db.sql(), id);
  if (!weight) throw InputError(fmt::format("weight \"{}\" is not a known reference weight.", id));
  const WeightCertificateInput typed = weight_certificate_from_dcc(*weight, in);
  try {
    return recalibrate_weight(db, actor, id, typed);
  } catch (const InputError& e) {
    // The checks name the options a typed certificate has; say that the values came from the file.
    throw InputError(fmt::format("--from-dcc {} gives: {}", in.file, e.what()));
  }
}

}  // namespace plumb::app
