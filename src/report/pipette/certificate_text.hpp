#pragma once
// Plain-text rendering of a stored pipette check certificate (kind "pipette_check").
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::report {

std::string pipette_certificate_text(const nlohmann::json& certificate, const std::string& content_sha256);

}  // namespace plumb::report
