#pragma once
// The calibration certificate's chart of the error of indication against the load: as found and as left as two
// series, the fitted model of the final stage, and the MPE. Pure: the certificate's stored content in, a spec out.
#include <nlohmann/json.hpp>

#include "report/chart/chart.hpp"

namespace plumb::report {

/// E(m) = I(m) - m from a stored fit of the indication (slope less one; calibration_text.cpp prints the same).
double calibration_model_error(const nlohmann::json& fit, double m);

/// From the certificate content `c` (its "instrument", "check" and "calibration" with "stages", "settings",
/// "capacity_g"): every stage as a series (as found, as left); the load axis from zero to the capacity; for an
/// OIML R 76 tolerance the in-service MPE drawn as steps over the whole range (R 76-1 Table 6 bands,
/// metrology/accuracy_classes), otherwise the MPE marked at the tested loads only.
ChartSpec calibration_error_chart(const nlohmann::json& c);

}  // namespace plumb::report
