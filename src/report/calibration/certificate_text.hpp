#pragma once
// Plain-text rendering of a stored balance calibration certificate (kind "balance_calibration").
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::report {

std::string calibration_certificate_text(const nlohmann::json& certificate, const std::string& content_sha256);

}  // namespace plumb::report
