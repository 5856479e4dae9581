#include "report/certificates/trail_checkpoint_note.hpp"

#include <fmt/format.h>

namespace plumb::report {

std::string trail_checkpoint_note(const nlohmann::json& c) {
  if (!c.contains("trail_checkpoint") || !c["trail_checkpoint"].is_object()) return "";
  const auto& cp = c["trail_checkpoint"];
  // The head hash is shortened as the content hash is not: the footer has one line, and 16 hex digits tell two
  // trails apart; the full checkpoint is in the JSON and in `audit checkpoint export`.
  return fmt::format(". Audit trail checkpoint {} ({} records, head {}..., signed {})",
                     cp.value("number", std::int64_t{0}), cp.value("records", std::int64_t{0}),
                     cp.value("head_hash", std::string()).substr(0, 16), cp.value("signed_at", std::string()));
}

}  // namespace plumb::report
