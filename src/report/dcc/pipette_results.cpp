// The measurement results of a pipette check certificate (ISO 8655-6 gravimetric method): the conditions
// behind the Z factor, the balance and weights used, and per test volume the mean volume, systematic and
// random error of every channel with its limits and conformity.
#include <fmt/format.h>

#include "report/dcc/parts.hpp"
#include "report/dcc/quantity.hpp"
#include "report/dcc/xml_tree.hpp"

namespace plumb::report::dcc {
namespace {

using nlohmann::json;

void add_balance_used(xmlNodePtr equipments, const json& balance) {
  if (!balance.is_object() || !balance.contains("id")) return;
  xmlNodePtr e = add(equipments, "measuringEquipment");
  set_attribute(e, "refType", "plumb_balanceUsed");
  add_text(e, "name", fmt::format("Balance {}", balance.value("id", "")));
  std::string check = fmt::format("checked on {} (run {}, {} procedure): {}; due {}", balance.value("checked_on", ""),
                                  balance.value("check_run", 0), balance.value("check_procedure", ""),
                                  balance.value("check_verdict", ""),
                                  balance["due_on"].is_string() ? balance["due_on"].get<std::string>() : "-");
  if (balance["check_certificate"].is_string())
    check += fmt::format(", certificate {}", balance["check_certificate"].get<std::string>());
  add_text(e, "description", fmt::format("readability d = {} g; {}.", balance.value("readability_g", ""), check));
  xmlNodePtr ids = add(e, "identifications");
  xmlNodePtr id = add(ids, "identification");
  add(id, "issuer", "owner");
  add(id, "value", balance.value("id", ""));
  add_text(id, "name", "balance id in the laboratory's register");
}

void add_conditions(xmlNodePtr result, const json& check) {
  xmlNodePtr conditions = add(result, "influenceConditions");
  const json& env = check["environment"];
  const json& z = check["z"];
  add_condition(conditions, "water temperature", "plumb_waterTemperature", env["water_temperature_c"],
                Unit::degree_celsius);
  add_condition(conditions, "air pressure", "plumb_airPressure", env["air_pressure_hpa"], Unit::hectopascal);
  add_condition(conditions, "relative humidity", "plumb_relativeHumidity", env["humidity_pct"], Unit::percent);
  add_condition(conditions, "evaporation loss per weighing", "plumb_evaporation", env["evaporation_g"], Unit::gram);
  add_condition(conditions, "water density (Tanaka et al., Metrologia 38 (2001) 301)", "plumb_waterDensity",
                z["water_density_kg_m3"], Unit::kilogram_per_cubic_metre);
  add_condition(conditions, "air density", "plumb_airDensity", z["air_density_kg_m3"], Unit::kilogram_per_cubic_metre);
  add_condition(conditions, "density of the balance's adjustment weights", "plumb_weightDensity",
                z["weight_density_kg_m3"], Unit::kilogram_per_cubic_metre);
  add_condition(conditions, "Z factor (ISO 8655-6)", "plumb_zFactor", z["z_ul_per_mg"], Unit::microlitre_per_milligram);
}

void add_volume(xmlNodePtr results, const json& volume, const std::string& limits_name) {
  RealList channel = list_in(Unit::one), n = list_in(Unit::one), mean = list_in(Unit::microlitre),
           systematic = list_in(Unit::microlitre), systematic_pct = list_in(Unit::percent),
           random = list_in(Unit::microlitre), cv = list_in(Unit::percent),
           limit_systematic = list_in(Unit::microlitre), limit_random = list_in(Unit::microlitre);
  std::vector<std::string> states;
  for (const auto& c : volume["channels"]) {
    channel.values.push_back(decimal_text(c["channel"], "channel"));
    n.values.push_back(decimal_text(c["n"], "n"));
    mean.values.push_back(decimal_text(c["mean_ul"], "mean volume"));
    systematic.values.push_back(decimal_text(c["systematic_error_ul"], "systematic error"));
    systematic_pct.values.push_back(decimal_text(c["systematic_error_pct"], "systematic error"));
    random.values.push_back(decimal_text(c["random_error_ul"], "random error"));
    cv.values.push_back(decimal_text(c["cv_pct"], "coefficient of variation"));
    limit_systematic.values.push_back(decimal_text(c["limits"]["systematic_ul"], "systematic error limit"));
    limit_random.values.push_back(decimal_text(c["limits"]["random_ul"], "random error limit"));
    states.push_back(c.value("verdict", "fail"));
  }
  xmlNodePtr data = add_result(results, fmt::format("Test volume {} uL", decimal_text(volume["selected_ul"], "volume")),
                               "plumb_testVolume");
  add_real_quantity(data, "selected volume", "plumb_selectedVolume", decimal_text(volume["selected_ul"], "volume"),
                    Unit::microlitre);
  xmlNodePtr list = add(data, "list");
  add_list_quantity(list, "channel", "plumb_channel", channel);
  add_list_quantity(list, "number of weighings", "plumb_count", n);
  add_list_quantity(list, "mean volume", "plumb_meanVolume", mean);
  xmlNodePtr s = add_list_quantity(list, "systematic error e_s", "plumb_systematicError", systematic);
  add_conformity(
      s, fmt::format("Conformity of each channel with the limits of {} (systematic and random error).", limits_name),
      states);
  add_list_quantity(list, "systematic error e_s, relative", "plumb_systematicErrorRelative", systematic_pct);
  add_list_quantity(list, "random error s_r", "plumb_randomError", random);
  add_list_quantity(list, "coefficient of variation CV", "plumb_coefficientOfVariation", cv);
  add_list_quantity(list, "limit of the systematic error", "plumb_systematicErrorLimit", limit_systematic);
  add_list_quantity(list, "limit of the random error", "plumb_randomErrorLimit", limit_random);
}

}  // namespace

void add_pipette_results(xmlNodePtr results, const json& doc) {
  const json& check = doc["check"];
  const std::string limits_name = check.value("policy_name", "");
  xmlNodePtr m = add(results, "measurementResult");
  add_text(m, "name", "Gravimetric volume check");
  add_text(m, "description",
           fmt::format("Gravimetric method of ISO 8655-6: V = (m + evaporation) x Z; limits {}.", limits_name));
  add_used_method(m, "gravimetric volume check", {"ISO 8655-6:2002", limits_name});
  xmlNodePtr equipments = add(m, "measuringEquipments");
  add_balance_used(equipments, doc["balance_used"]);
  add_reference_weights(equipments, doc["weights"]);
  if (!equipments->children) {
    xmlUnlinkNode(equipments);
    xmlFreeNode(equipments);
  }
  add_conditions(m, check);
  xmlNodePtr list = add(m, "results");
  for (const auto& volume : check["volumes"]) add_volume(list, volume, limits_name);
}

}  // namespace plumb::report::dcc
