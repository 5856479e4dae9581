#include "web/visitor.hpp"

#include "app/people/permissions.hpp"
#include "core/errors.hpp"
#include "web/security.hpp"

namespace plumb::web {

VisitorLookup find_visitor(store::Database& db, const Site& site, const WebRequest& request) {
  VisitorLookup out;
  const std::string token = request.cookie(session_cookie);
  if (token.empty()) return out;
  try {
    Visitor v;
    v.who = app::authenticate(db, "web view", {std::nullopt, token, nullptr});
    v.token = token;
    v.csrf = csrf_for_session(site, token);
    out.visitor = std::move(v);
  } catch (const AccessError& e) {
    out.notice = e.what();
  }
  return out;
}

bool may(const Visitor& visitor, const std::string& command) {
  try {
    require_role(visitor, command);
    return true;
  } catch (const AccessError&) {
    return false;
  }
}

void require_role(const Visitor& visitor, const std::string& command) {
  app::require_permission(command, visitor.who.roles, visitor.who.login);
}

std::string csrf_for_session(const Site& site, const std::string& session_token) {
  return keyed_token(site.secret, "csrf", session_token);
}

bool csrf_valid(const Visitor& visitor, const WebRequest& request) {
  return same_token(request.param("csrf"), visitor.csrf);
}

nlohmann::json navigation_of(const Visitor& visitor) {
  return {{"record", may(visitor, "check record")},
          {"approve", may(visitor, "certificate approve")},
          {"users", may(visitor, "user add")}};
}

}  // namespace plumb::web
