#pragma once
// `plumb balance in-use BAL` as text: the declared terms of normal use, the calibration drawn on and its
// approximation over the range, the global uncertainty U(W) in the declared form, both minimum weights and which
// one a weighing procedure must respect (the JSON of app::balance_in_use).
#include <nlohmann/json.hpp>

#include <string>

namespace plumb::report {

std::string balance_in_use_text(const nlohmann::json& in_use);

}  // namespace plumb::report
