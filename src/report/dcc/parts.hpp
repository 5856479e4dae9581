#pragma once
// The parts of a DCC that certificate_dcc.cpp assembles: the administrative data every certificate has,
// and the measurement results of each certificate kind (one file each).
#include <libxml/tree.h>

#include <nlohmann/json.hpp>
#include <string>

#include <vector>

#include "report/dcc/certificate_dcc.hpp"
#include "report/dcc/units.hpp"

namespace plumb::report::dcc {

/// dcc:administrativeData: software, core data, item, laboratory, responsible persons, customer, statements.
void add_administrative_data(xmlNodePtr root, const nlohmann::json& doc, const DccOptions& options);

/// dcc:measurementResult elements of each kind, added to dcc:measurementResults.
void add_calibration_results(xmlNodePtr results, const nlohmann::json& doc);
void add_pipette_results(xmlNodePtr results, const nlohmann::json& doc);
void add_weekly_check_results(xmlNodePtr results, const nlohmann::json& doc);

/// dcc:measuringEquipments with the reference weights of the document ("weights"), each with its
/// certificate number, dates and conventional mass with U and k: the metrological traceability.
void add_reference_weights(xmlNodePtr measuring_equipments, const nlohmann::json& weights);

/// dcc:usedMethods with one method: its name and the standards it follows.
void add_used_method(xmlNodePtr measurement_result, const std::string& name, const std::vector<std::string>& norms);

/// A dcc:result with a name and an empty dcc:data; returns the data element.
xmlNodePtr add_result(xmlNodePtr results, const std::string& name, const char* ref_type);

/// dcc:measurementMetaData on a quantity: the statement of conformity of each of its values
/// (plumb's states mapped to pass / conditionalPass / conditionalFail / fail of the DCC).
void add_conformity(xmlNodePtr quantity, const std::string& declaration, const std::vector<std::string>& state_keys);

/// plumb's state key ("pass", "pass-not-proven", "fail-not-proven", "fail") as a DCC conformity status.
std::string dcc_conformity(const std::string& state_key);

/// A dcc:influenceCondition with one quantity (skipped when the stored value is null).
void add_condition(xmlNodePtr conditions, const std::string& name, const char* ref_type, const nlohmann::json& value,
                   Unit unit);

}  // namespace plumb::report::dcc
