#pragma once
// Which path reaches which page, and what every page shares: the database opened for the request, the visitor
// from the session cookie, the log-in requirement, the CSRF check of every POST, and one sentence for a refusal.
#include "web/page.hpp"
#include "web/security.hpp"

namespace plumb::web {

/// The response to `request` (the HTTP library's only entry into the pages).
WebResponse respond(const Site& site, LoginLimiter& limiter, const WebRequest& request);

}  // namespace plumb::web
