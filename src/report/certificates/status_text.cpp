#include "report/certificates/status_text.hpp"

#include <fmt/format.h>

#include "report/format/text.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

std::string field(const json& j, const char* key) {
  return j.contains(key) && j[key].is_string() ? j[key].get<std::string>() : "-";
}

}  // namespace

std::string certificate_status_line(const json& status) {
  const std::string state = status.value("state", "draft");
  if (state == "withdrawn") {
    const json& w = status["withdrawn"];
    return fmt::format(
        "WITHDRAWN on {} (recorded by {}: {}). The check it certifies was voided; this certificate is "
        "no longer valid.",
        field(w, "at"), field(w, "recorded_by"), field(w, "reason"));
  }
  if (state == "superseded") {
    const json& s = status["superseded"];
    return fmt::format(
        "SUPERSEDED by certificate {} on {} (correction recorded by {}: {}). This certificate is no "
        "longer valid.",
        field(s, "by_certificate"), field(s, "at"), field(s, "recorded_by"), field(s, "reason"));
  }
  if (state == "approved") {
    const json& a = status["approval"];
    return fmt::format("APPROVED by {} on {} (\"{}\").", field(a, "by"), field(a, "at"), field(a, "meaning"));
  }
  return "DRAFT, not yet approved: not valid until someone other than the operator of the check reviews and "
         "approves it.";
}

std::string certificate_status_summary(const json& status) {
  const std::string state = status.value("state", "draft");
  if (state == "withdrawn")
    return "WITHDRAWN on " + field(status["withdrawn"], "at").substr(0, 10) + ", no longer valid";
  if (state == "superseded")
    return "SUPERSEDED by " + field(status["superseded"], "by_certificate") + ", no longer valid";
  if (state == "approved")
    return fmt::format("APPROVED by {} on {}", field(status["approval"], "by"),
                       field(status["approval"], "at").substr(0, 10));
  return "DRAFT, not approved";
}

}  // namespace plumb::report
