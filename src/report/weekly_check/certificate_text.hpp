#pragma once
// Plain-text rendering of a stored weekly check certificate (kind "balance_check").
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::report {

std::string balance_check_certificate_text(const nlohmann::json& certificate, const std::string& content_sha256);

}  // namespace plumb::report
