#pragma once
// The signed audit-trail checkpoint that covers a certificate, as its footer names it.
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::report {

/// ". Audit trail checkpoint 7 (42 records, head 3f2a..., signed 2026-11-30T10:00:00Z)" when the document carries
/// "trail_checkpoint" (app::certificate_document), else empty.
std::string trail_checkpoint_note(const nlohmann::json& c);

}  // namespace plumb::report
