// Parts of the measurement results that every certificate kind writes the same way.
#include <fmt/format.h>

#include "report/dcc/parts.hpp"
#include "report/dcc/quantity.hpp"
#include "report/dcc/xml_tree.hpp"

namespace plumb::report::dcc {

using nlohmann::json;

void add_reference_weights(xmlNodePtr measuring_equipments, const json& weights) {
  for (const auto& w : weights) {
    xmlNodePtr e = add(measuring_equipments, "measuringEquipment");
    set_attribute(e, "refType", "plumb_referenceWeight");
    add_text(e, "name",
             fmt::format("Reference weight {} ({}, OIML R 111 class {})", w.value("id", ""), w.value("nominal", ""),
                         w.value("class", "")));
    add_text(e, "description",
             fmt::format("Calibration certificate {}, calibrated {}, due {}; conventional mass = nominal + correction "
                         "({} g).",
                         w.value("certificate", ""), w.value("calibrated_on", ""), w.value("due_on", ""),
                         w.value("correction_g", "")));
    xmlNodePtr ids = add(e, "identifications");
    xmlNodePtr id = add(ids, "identification");
    add(id, "issuer", "owner");
    add(id, "value", w.value("id", ""));
    add_text(id, "name", "reference weight id");
    id = add(ids, "identification");
    add(id, "issuer", "other");
    add(id, "value", w.value("certificate", ""));
    add_text(id, "name", "calibration certificate number of the weight");
    xmlNodePtr quantities = add(e, "measuringEquipmentQuantities");
    xmlNodePtr q = add(quantities, "measuringEquipmentQuantity");
    set_attribute(q, "refType", "plumb_conventionalMass");
    add_text(q, "name", "conventional mass (OIML D 28) from the weight's certificate");
    xmlNodePtr real = add_si(q, "real");
    add_si(real, "value", decimal_text(w["conventional_mass_g"], "conventional mass of a weight"));
    add_si(real, "unit", dsi_text(Unit::gram));
    xmlNodePtr u = add_si(real, "expandedUnc");
    add_si(u, "uncertainty", decimal_text(w["uncertainty_g"], "uncertainty of a weight"));
    add_si(u, "coverageFactor", decimal_text(w["k"], "coverage factor of a weight"));
    add_si(u, "coverageProbability", normal_coverage_probability(w["k"]));
  }
}

void add_used_method(xmlNodePtr measurement_result, const std::string& name, const std::vector<std::string>& norms) {
  xmlNodePtr methods = add(measurement_result, "usedMethods");
  xmlNodePtr m = add(methods, "usedMethod");
  add_text(m, "name", name);
  for (const auto& n : norms) add(m, "norm", n);
}

xmlNodePtr add_result(xmlNodePtr results, const std::string& name, const char* ref_type) {
  xmlNodePtr r = add(results, "result");
  set_attribute(r, "refType", ref_type);
  add_text(r, "name", name);
  return add(r, "data");
}

std::string dcc_conformity(const std::string& state_key) {
  // ILAC G8:09/2019 4.2.3 names the states between a clear pass and a clear fail "conditional".
  if (state_key == "pass") return "pass";
  if (state_key == "pass-not-proven") return "conditionalPass";
  if (state_key == "fail-not-proven") return "conditionalFail";
  return "fail";
}

void add_conformity(xmlNodePtr quantity, const std::string& declaration, const std::vector<std::string>& state_keys) {
  xmlNodePtr meta = add(quantity, "measurementMetaData");
  xmlNodePtr m = add(meta, "metaData");
  set_attribute(m, "refType", "plumb_conformity");
  add(m, "norm", "ILAC G8:09/2019");
  add_text(m, "declaration", declaration);
  std::vector<std::string> states;
  states.reserve(state_keys.size());
  for (const auto& k : state_keys) states.push_back(dcc_conformity(k));
  if (states.size() == 1) {
    add(m, "conformity", states[0]);
  } else {
    std::string list;
    for (const auto& s : states) list += (list.empty() ? "" : " ") + s;
    add(m, "conformityXMLList", list);
  }
}

void add_condition(xmlNodePtr conditions, const std::string& name, const char* ref_type, const json& value, Unit unit) {
  if (value.is_null()) return;
  xmlNodePtr c = add(conditions, "influenceCondition");
  set_attribute(c, "refType", ref_type);
  add_text(c, "name", name);
  xmlNodePtr data = add(c, "data");
  add_real_quantity(data, name, "", decimal_text(value, name), unit);
}

}  // namespace plumb::report::dcc
