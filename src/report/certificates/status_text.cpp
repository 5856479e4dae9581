#include "report/certificates/status_text.hpp"

#include <fmt/format.h>

#include "report/format/text.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

std::string field(const json& j, const char* key) {
  return j.contains(key) && j[key].is_string() ? j[key].get<std::string>() : "-";
}

void add_wrapped(std::string& out, const std::string& text) {
  for (const auto& l : wrap(text, 78)) out += l + "\n";
}

}  // namespace

std::string certificate_status_banner(const json& status) {
  std::string out;
  const std::string state = status.value("state", "draft");
  if (state == "withdrawn") {
    const json& w = status["withdrawn"];
    add_wrapped(out, fmt::format("STATUS: WITHDRAWN on {} (recorded by {}: {}). The check it certifies was voided; "
                                 "this certificate is no longer valid.",
                                 field(w, "at"), field(w, "recorded_by"), field(w, "reason")));
  } else if (state == "superseded") {
    const json& s = status["superseded"];
    add_wrapped(out, fmt::format("STATUS: SUPERSEDED by certificate {} on {} (correction recorded by {}: {}). This "
                                 "certificate is no longer valid.",
                                 field(s, "by_certificate"), field(s, "at"), field(s, "recorded_by"), field(s, "reason")));
  } else if (state == "approved") {
    const json& a = status["approval"];
    add_wrapped(out, fmt::format("STATUS: APPROVED by {} on {} (\"{}\").", field(a, "by"), field(a, "at"),
                                 field(a, "meaning")));
  } else {
    add_wrapped(out, "STATUS: DRAFT, not yet approved: someone other than the operator of the check must review and "
                     "approve it.");
  }
  if (status.contains("replaces") && status["replaces"].is_string())
    add_wrapped(out, fmt::format("This certificate replaces certificate {}.", status["replaces"].get<std::string>()));
  return out;
}

std::string certificate_status_summary(const json& status) {
  const std::string state = status.value("state", "draft");
  if (state == "withdrawn")
    return "WITHDRAWN on " + field(status["withdrawn"], "at").substr(0, 10) + ", no longer valid";
  if (state == "superseded") return "SUPERSEDED by " + field(status["superseded"], "by_certificate") + ", no longer valid";
  if (state == "approved")
    return fmt::format("APPROVED by {} on {}", field(status["approval"], "by"),
                       field(status["approval"], "at").substr(0, 10));
  return "DRAFT, not approved";
}

std::string certificate_review_lines(const json& status) {
  std::string out = "Review and approval\n";
  const json& a = status.value("approval", json());
  if (a.is_object())
    add_wrapped(out, fmt::format("  Approved by {} on {}; meaning of the signature: \"{}\" (OS account {}).",
                                 field(a, "by"), field(a, "at"), field(a, "meaning"), field(a, "os_user")));
  else
    out += "  Not approved yet (draft).\n";
  for (const auto& sig : status.value("signatures", json::array()))
    add_wrapped(out, fmt::format("  Signed electronically by {} (user {}) at {} UTC, meaning \"{}\".", field(sig, "name"),
                                 sig.value("user_id", 0), field(sig, "at"), field(sig, "meaning")));
  if (status.value("state", "") == "withdrawn")
    add_wrapped(out, fmt::format("  Withdrawn: {}.", field(status["withdrawn"], "reason")));
  if (status.value("superseded", json()).is_object())
    add_wrapped(out, fmt::format("  Superseded by certificate {}.", field(status["superseded"], "by_certificate")));
  return out;
}

}  // namespace plumb::report
