#pragma once
// The standing of a certificate (draft, approved, superseded) as text lines framing the certificate.
// The status is not part of the stored content: it is read from events and shown beside it.
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::report {

/// Lines printed above the certificate: its state in capitals, and what it replaces or what replaced it.
std::string certificate_status_banner(const nlohmann::json& status);
/// One short line for a page header (PDF): "SUPERSEDED by BC-2026-0002", "APPROVED by Q. Manager on 2026-12-02",
/// "DRAFT, not approved".
std::string certificate_status_summary(const nlohmann::json& status);
/// Lines printed below the certificate: the review record (who approved it, when, and the meaning).
std::string certificate_review_lines(const nlohmann::json& status);

}  // namespace plumb::report
