// The measurement results of a balance calibration certificate (EURAMET cg-18): one dcc:measurementResult
// per stage (as found, and as left after an adjustment), each with its repeatability, eccentricity and error
// of indication at every load with U, k and the coverage probability the run stored.
#include <fmt/format.h>

#include "report/dcc/parts.hpp"
#include "report/dcc/quantity.hpp"
#include "report/dcc/xml_tree.hpp"

namespace plumb::report::dcc {
namespace {

using nlohmann::json;

/// The stored run's loads of a stage ("as-found" -> check.as_found.loads): they hold each budget's coverage
/// probability, which the certificate's error table does not repeat.
const json& stored_loads(const json& doc, const std::string& stage) {
  static const json none = json::array();
  const std::string key = stage == "as-left" ? "as_left" : "as_found";
  const json& check = doc["check"];
  if (!check.contains(key) || !check[key].is_object() || !check[key].contains("loads")) return none;
  return check[key]["loads"];
}

std::string coverage_probability(const json& loads, std::size_t i, const json& row) {
  if (i < loads.size() && loads[i].contains("budget") && loads[i]["budget"].contains("coverage_probability"))
    return decimal_text(loads[i]["budget"]["coverage_probability"], "coverage probability");
  return normal_coverage_probability(row["k"]);
}

void add_error_of_indication(xmlNodePtr results, const json& doc, const json& stage) {
  const json& rows = stage["error_of_indication"];
  if (rows.empty()) return;
  const json& loads = stored_loads(doc, stage.value("stage", ""));
  RealList nominal = list_in(Unit::gram), reference = list_in(Unit::gram), indication = list_in(Unit::gram),
           error = list_in(Unit::gram), tolerance = list_in(Unit::gram), hysteresis = list_in(Unit::gram);
  std::vector<std::string> states;
  bool any_hysteresis = false;
  for (std::size_t i = 0; i < rows.size(); ++i) {
    const json& r = rows[i];
    const std::string label = list_label(r.value("load", ""));
    nominal.labels.push_back(label);
    nominal.values.push_back(decimal_text(r["nominal_g"], "nominal load"));
    reference.values.push_back(decimal_text(r["reference_g"], "reference value"));
    indication.values.push_back(decimal_text(r["indication_g"], "indication"));
    error.labels.push_back(label);
    error.values.push_back(decimal_text(r["error_g"], "error of indication"));
    error.uncertainties.push_back(
        {decimal_text(r["U_g"], "expanded uncertainty"), decimal_text(r["k"], "k"), coverage_probability(loads, i, r)});
    tolerance.values.push_back(decimal_text(r["tolerance_g"], "tolerance"));
    if (!r["hysteresis_g"].is_null()) any_hysteresis = true;
    hysteresis.values.push_back(r["hysteresis_g"].is_null() ? "0" : decimal_text(r["hysteresis_g"], "hysteresis"));
    states.push_back(r.value("conformity_key", "fail"));
  }
  xmlNodePtr data = add_result(results, "Error of indication E = I - m_ref at each load", "plumb_errorOfIndication");
  xmlNodePtr list = add(data, "list");
  add_list_quantity(list, "nominal load", "plumb_nominalLoad", nominal);
  add_list_quantity(list, "reference value (conventional mass of the weights)", "plumb_referenceValue", reference);
  add_list_quantity(list, "indication", "plumb_indication", indication);
  xmlNodePtr e = add_list_quantity(list, "error of indication", "plumb_error", error);
  add_conformity(e,
                 fmt::format("Conformity of the error at each load with its tolerance ({}).",
                             doc["calibration"].value("tolerance", "")),
                 states);
  add_list_quantity(list, "tolerance (maximum permissible error)", "plumb_tolerance", tolerance);
  if (any_hysteresis) add_list_quantity(list, "hysteresis (zero where not measured)", "plumb_hysteresis", hysteresis);
}

void add_repeatability(xmlNodePtr results, const json& stage) {
  for (const auto& r : stage["repeatability"]) {
    xmlNodePtr data =
        add_result(results, fmt::format("Repeatability at {} g", r.value("load_g", "")), "plumb_repeatability");
    add_real_quantity(data, "test load", "plumb_load", decimal_text(r["load_g"], "repeatability load"), Unit::gram);
    add_real_quantity(data, "number of readings", "plumb_count", decimal_text(r["n"], "n"), Unit::one);
    add_real_quantity(data, "mean of the readings", "plumb_mean", decimal_text(r["mean_g"], "mean"), Unit::gram);
    add_real_quantity(data, "standard deviation s", "plumb_standardDeviation", decimal_text(r["sd_g"], "sd"),
                      Unit::gram);
  }
}

void add_eccentricity(xmlNodePtr results, const json& stage) {
  const json& ecc = stage["eccentricity"];
  if (!ecc.is_object() || ecc.empty()) return;
  xmlNodePtr data =
      add_result(results, fmt::format("Eccentricity at {} g", ecc.value("load_g", "")), "plumb_eccentricity");
  add_real_quantity(data, "reading at the centre", "plumb_centreReading", decimal_text(ecc["centre_g"], "centre"),
                    Unit::gram);
  RealList deviations = list_in(Unit::gram);
  for (const auto& d : ecc["deviations"]) {
    deviations.labels.push_back(list_label(d.value("position", "")));
    deviations.values.push_back(decimal_text(d["deviation_g"], "eccentricity deviation"));
  }
  if (!deviations.values.empty())
    add_list_quantity(data, "deviation from the centre reading at each position", "plumb_deviation", deviations);
  add_real_quantity(data, fmt::format("largest deviation (at {})", ecc.value("max_position", "")), "plumb_maxDeviation",
                    decimal_text(ecc["max_abs_deviation_g"], "largest deviation"), Unit::gram);
}

void add_fit(xmlNodePtr results, const json& stage) {
  const json& fit = stage["fit"];
  if (!fit.is_object() || !fit.contains("error_equation")) return;
  xmlNodePtr data =
      add_result(results, fmt::format("Fitted model of the error ({})", fit.value("model", "")), "plumb_fit");
  add_text(data, "text", fmt::format("{} (m and E in g)", fit.value("error_equation", "")));
  add_real_quantity(data, "root mean square of the residuals", "plumb_rmse", decimal_text(fit["rmse_g"], "RMSE"),
                    Unit::gram);
}

void add_environment(xmlNodePtr result, const json& calibration) {
  const json& env = calibration["environment"];
  if (!env.is_object() || env["temperature_c"].is_null()) return;  // not measured: nothing to state
  xmlNodePtr conditions = add(result, "influenceConditions");
  add_condition(conditions, "air temperature", "plumb_airTemperature", env["temperature_c"], Unit::degree_celsius);
  add_condition(conditions, "air pressure", "plumb_airPressure", env["pressure_hpa"], Unit::hectopascal);
  add_condition(conditions, "relative humidity", "plumb_relativeHumidity", env["humidity_pct"], Unit::percent);
  add_condition(conditions, fmt::format("air density ({})", env.value("air_method", "")), "plumb_airDensity",
                env["air_density_kg_m3"], Unit::kilogram_per_cubic_metre);
}

/// Normal use as the certificate states it (content "in_use"): U(W) in its form with the linear coefficients, the
/// minimum weight from calibration and the USP <41> one, which binds; or the line that no terms are declared.
void add_in_use(xmlNodePtr results, const json& doc) {
  const json& in = doc.value("in_use", json());
  if (!in.is_object() || in.empty()) return;  // issued before normal use was stated
  xmlNodePtr data = add_result(results, "Uncertainty of a weighing result in use and minimum weight", "plumb_inUse");
  const json& u = in.value("in_use", json());
  if (!u.is_object()) {
    add_text(data, "text", in.value("statement", ""));
    return;
  }
  const json& mw = in.value("minimum_weight", json());
  add_text(data, "text",
           fmt::format("{} {} Sources: {} {}", u.value("formula", ""), mw.value("statement", ""),
                       in.value("sources", ""), mw.value("caution", "")));
  add_real_quantity(data, "U(W) linear form, a", "plumb_inUseA", decimal_text(u["a_g"], "in-use a"), Unit::gram);
  add_real_quantity(data, "U(W) linear form, b", "plumb_inUseB", decimal_text(u["b"], "in-use b"), Unit::one);
  if (u["minimum_weight_g"].is_number())
    add_real_quantity(data, "minimum weight from calibration", "plumb_minimumWeightCalibration",
                      decimal_text(u["minimum_weight_g"], "minimum weight from calibration"), Unit::gram);
  const json& usp = in.value("usp41", json());
  if (usp.contains("minimum_weight_g"))
    add_real_quantity(data, "USP <41> minimum weight", "plumb_minimumWeightUsp41",
                      decimal_text(usp["minimum_weight_g"], "USP <41> minimum weight"), Unit::gram);
}

}  // namespace

void add_calibration_results(xmlNodePtr results, const json& doc) {
  const json& cal = doc["calibration"];
  for (const auto& stage : cal["stages"]) {
    xmlNodePtr m = add(results, "measurementResult");
    set_attribute(m, "refType", stage.value("stage", "") == "as-left" ? "plumb_asLeft" : "plumb_asFound");
    add_text(m, "name", stage.value("title", ""));
    add_text(m, "description",
             fmt::format("{}; tolerance {}; result of this stage: {}.", cal.value("procedure", ""),
                         cal.value("tolerance", ""), stage.value("state", "")));
    add_used_method(m, cal.value("procedure", ""), {"EURAMET cg-18", "JCGM 100:2008 (GUM)"});
    if (!doc["weights"].empty()) add_reference_weights(add(m, "measuringEquipments"), doc["weights"]);
    add_environment(m, cal);
    xmlNodePtr list = add(m, "results");
    add_repeatability(list, stage);
    add_eccentricity(list, stage);
    add_error_of_indication(list, doc, stage);
    add_fit(list, stage);
    if (&stage == &cal["stages"].back()) add_in_use(list, doc);
  }
}

}  // namespace plumb::report::dcc
