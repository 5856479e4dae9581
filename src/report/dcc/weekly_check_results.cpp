// The measurement results of a weekly balance check certificate: repeated readings of one reference weight,
// their mean, bias against the weight's conventional mass and standard deviation, and each criterion of the
// lab's policy (USP <41> or its own limits) with its limit and conformity.
#include <fmt/format.h>

#include "report/dcc/parts.hpp"
#include "report/dcc/quantity.hpp"
#include "report/dcc/xml_tree.hpp"

namespace plumb::report::dcc {
namespace {

using nlohmann::json;

void add_if_stored(xmlNodePtr data, const char* name, const char* ref_type, const json& value, Unit unit) {
  if (!value.is_null()) add_real_quantity(data, name, ref_type, decimal_text(value, name), unit);
}

}  // namespace

void add_weekly_check_results(xmlNodePtr results, const json& doc) {
  const json& check = doc["check"];
  const std::string policy = check.value("policy_name", "");
  xmlNodePtr m = add(results, "measurementResult");
  add_text(m, "name", "Balance check: repeatability and accuracy");
  add_text(m, "description", fmt::format("Repeated weighings of one reference weight, judged under {}.", policy));
  add_used_method(m, fmt::format("repeatability and accuracy check ({})", policy), {policy});
  if (!doc["weights"].empty()) add_reference_weights(add(m, "measuringEquipments"), doc["weights"]);
  xmlNodePtr list = add(m, "results");

  xmlNodePtr data = add_result(list, "Readings of the reference weight", "plumb_readings");
  add_if_stored(data, "number of readings", "plumb_count", check["n"], Unit::one);
  add_if_stored(data, "reference value (conventional mass)", "plumb_referenceValue", check["reference_g"], Unit::gram);
  add_if_stored(data, "mean of the readings", "plumb_mean", check["mean_g"], Unit::gram);
  add_if_stored(data, "bias (mean - reference value)", "plumb_bias", check["bias_g"], Unit::gram);
  add_if_stored(data, "standard deviation s", "plumb_standardDeviation", check["sd_g"], Unit::gram);
  add_if_stored(data, "minimum weight", "plumb_minimumWeight", check["min_weight_g"], Unit::gram);

  for (const auto& c : check["criteria"]) {
    xmlNodePtr criterion = add_result(
        list, fmt::format("Criterion: {} ({})", c.value("name", ""), c.value("basis", "")), "plumb_criterion");
    const std::string quantity = c.value("quantity", "");
    xmlNodePtr measured =
        add_real_quantity(criterion, quantity, "plumb_measured", decimal_text(c["measured_g"], quantity), Unit::gram);
    add_conformity(measured, fmt::format("Conformity of the {} with its limit.", quantity),
                   {c.value("pass", false) ? "pass" : "fail"});
    add_if_stored(criterion, "limit", "plumb_limit", c["limit_g"], Unit::gram);
  }
}

}  // namespace plumb::report::dcc
