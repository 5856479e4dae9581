#pragma once
// The standing of a certificate (draft, approved, superseded, withdrawn) in words. The status is not part of the
// stored content: it is read from events and shown beside it in every rendering (report/certificates/document).
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::report {

/// The standing today in one sentence: "DRAFT, not yet approved: ...", "APPROVED by Q. Manager on ... (\"meaning\").",
/// "SUPERSEDED by certificate BC-2026-0002 on ... (correction recorded by ...: reason). ...", "WITHDRAWN on ...".
std::string certificate_status_line(const nlohmann::json& status);
/// One short line for a page header: "SUPERSEDED by BC-2026-0002, no longer valid", "APPROVED by Q. Manager on
/// 2026-12-02", "DRAFT, not approved".
std::string certificate_status_summary(const nlohmann::json& status);

}  // namespace plumb::report
