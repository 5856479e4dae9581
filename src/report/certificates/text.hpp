#pragma once
// Plain-text rendering of a stored certificate (the JSON document assembled when it was issued).
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::report {

std::string certificate_text(const nlohmann::json& certificate, const std::string& content_sha256);

}  // namespace plumb::report
