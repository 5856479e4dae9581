#pragma once
// Text, CSV and JSON renderings of the trend outputs (history table, control chart, drift, interval
// review). JSON values carry their unit in the key ("bias_mg", "bias_u_mg"), dates are ISO 8601.
#include <nlohmann/json.hpp>
#include <string>

#include "report/history/views.hpp"

namespace plumb::report {

std::string history_text(const HistoryView& v);
std::string history_csv(const HistoryView& v);
nlohmann::json history_json(const HistoryView& v);

std::string control_chart_text(const ControlChartView& v);
nlohmann::json control_chart_json(const ControlChartView& v);

std::string drift_text(const DriftView& v);
nlohmann::json drift_json(const DriftView& v);

std::string interval_review_text(const IntervalReviewView& v);
nlohmann::json interval_review_json(const IntervalReviewView& v);

/// "bias_mg" from key "bias" and unit "mg" (dashes become underscores).
std::string value_key(const std::string& key, const std::string& unit, const std::string& infix = "");

}  // namespace plumb::report
