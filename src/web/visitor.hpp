#pragma once
// Who is asking: the session cookie's token, authenticated by app/people (the lab's idle time ends it), and what the
// one table of permissions (app/people/permissions.cpp) lets that user do.
#include <optional>
#include <string>

#include "store/database.hpp"
#include "web/page.hpp"

namespace plumb::web {

struct VisitorLookup {
  std::optional<Visitor> visitor;
  std::string notice;  ///< why there is none when a cookie was sent (the session ended after the idle time)
};

/// The visitor of the request's session cookie, allowed the command "web view".
VisitorLookup find_visitor(store::Database& db, const Site& site, const WebRequest& request);

/// Whether the visitor's roles allow `command` ("check record").
bool may(const Visitor& visitor, const std::string& command);
/// AccessError (the table's sentence) unless they do.
void require_role(const Visitor& visitor, const std::string& command);

/// The CSRF token of a session.
std::string csrf_for_session(const Site& site, const std::string& session_token);
/// Whether the request's csrf field is the token of the visitor's session.
bool csrf_valid(const Visitor& visitor, const WebRequest& request);

/// The links the navigation shows this visitor.
nlohmann::json navigation_of(const Visitor& visitor);

}  // namespace plumb::web
