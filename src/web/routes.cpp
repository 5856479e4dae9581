#include "web/routes.hpp"

#include <fmt/format.h>

#include <regex>

#include "core/errors.hpp"
#include "web/pages.hpp"
#include "web/render.hpp"
#include "web/visitor.hpp"

namespace plumb::web {
namespace {

struct Route {
  const char* method;
  std::regex pattern;
  bool open;  ///< reachable without a session (log-in, password change)
  WebResponse (*page)(PageContext&);
};

// Ids in paths are the lab's ids (letters, digits, '-', '_', '.'); anything else is not a route.
const std::vector<Route>& routes() {
  static const std::vector<Route> all = [] {
    const auto r = [](const char* method, const char* pattern, bool open, WebResponse (*page)(PageContext&)) {
      return Route{method, std::regex(pattern), open, page};
    };
    return std::vector<Route>{
        r("GET", "/login", true, login_form),
        r("POST", "/login", true, login_submit),
        r("POST", "/password", true, password_submit),
        r("POST", "/logout", false, logout_submit),
        r("GET", "/", false, overview_page),
        r("GET", "/instruments", false, instruments_page),
        r("GET", "/instruments/([A-Za-z0-9._-]+)", false, instrument_item_page),
        r("GET", "/instruments/([A-Za-z0-9._-]+)/chart/([a-z0-9@._-]+)\\.svg", false, instrument_chart),
        r("GET", "/weights", false, weights_page),
        r("GET", "/audit", false, audit_page),
        r("GET", "/audit/verify", false, verification_page),
        r("GET", "/checks/new", false, check_form),
        r("POST", "/checks/preview", false, check_preview),
        r("POST", "/checks", false, check_submit),
        r("GET", "/pipette-checks/new", false, pipette_check_form),
        r("POST", "/pipette-checks/preview", false, pipette_check_preview),
        r("POST", "/pipette-checks", false, pipette_check_submit),
        r("GET", "/calibrations/new", false, calibration_form),
        r("POST", "/calibrations", false, calibration_submit),
        r("GET", "/runs/([0-9]{1,18})", false, run_page),
        r("POST", "/runs/([0-9]{1,18})/void", false, run_void_submit),
        r("POST", "/runs/([0-9]{1,18})/correct", false, run_correct_submit),
        r("GET", "/users", false, users_page),
        r("POST", "/users", false, user_add_submit),
        r("POST", "/users/([a-z0-9._-]{1,64})/(grant|revoke|deactivate|reactivate|unlock|reset)", false,
          user_change_submit),
        r("GET", "/certificates", false, certificates_page),
        r("POST", "/certificates/issue", false, certificate_issue_submit),
        r("GET", "/certificates/([A-Za-z0-9._-]+)", false, certificate_item_page),
        r("GET", "/certificates/([A-Za-z0-9._-]+)/document", false, certificate_document_page),
        r("GET", "/certificates/([A-Za-z0-9._-]+)/download/(pdf|json|dcc)", false, certificate_download),
        r("POST", "/certificates/([A-Za-z0-9._-]+)/approve", false, certificate_approve_submit),
        r("POST", "/certificates/([A-Za-z0-9._-]+)/void", false, certificate_void_submit),
    };
  }();
  return all;
}

WebResponse plain(int status, const std::string& text) {
  WebResponse r;
  r.status = status;
  r.content_type = "text/plain; charset=utf-8";
  r.body = text + "\n";
  return r;
}

}  // namespace

WebResponse respond(const Site& site, LoginLimiter& limiter, const WebRequest& request) {
  if (request.method == "GET" && request.path.starts_with("/static/")) return static_file(request.path.substr(8));
  const Route* route = nullptr;
  bool other_method = false;
  std::smatch m;
  for (const auto& candidate : routes()) {
    if (!std::regex_match(request.path, m, candidate.pattern)) continue;
    if (request.method != candidate.method) {
      other_method = true;
      continue;
    }
    route = &candidate;
    break;
  }
  if (!route) return other_method ? plain(405, "method not allowed") : plain(404, "not found");
  WebRequest routed = request;
  routed.path_parts.clear();
  std::regex_match(routed.path, m, route->pattern);
  for (std::size_t i = 1; i < m.size(); ++i) routed.path_parts.push_back(m[i].str());

  const Visitor* visitor = nullptr;
  VisitorLookup found;
  try {
    store::Database db(site.options.db, store::Database::Open::existing);
    found = find_visitor(db, site, routed);
    if (found.visitor) visitor = &*found.visitor;
    PageContext c{site, db, routed, visitor, limiter, found.notice};
    if (!route->open && !visitor) {
      if (routed.method == "POST")
        return message_page(401, "Log in first",
                            "This form needs a logged-in user; log "
                            "in and send it again.",
                            nullptr);
      // A session the lab's idle time ended says so once, on the log-in page; its cookie goes.
      const bool idle = found.notice.find("idle") != std::string::npos;
      auto r = redirect_to(idle ? "/login?idle=1" : "/login");
      if (!routed.cookie(session_cookie).empty())
        r.headers.emplace_back("Set-Cookie", expired_cookie_header(session_cookie, site.tls));
      return r;
    }
    if (!route->open && routed.method == "POST" && !csrf_valid(*visitor, routed))
      return message_page(403, "Form refused",
                          "The form's security token is missing or does not belong to this session; reload the page "
                          "and send it again.",
                          visitor);
    return route->page(c);
  } catch (const AccessError& e) {
    return message_page(403, "Not allowed", e.what(), visitor);
  } catch (const InputError& e) {
    const std::string sentence = e.what();
    const bool unknown = sentence.find("is not registered") != std::string::npos ||
                         sentence.find("no certificate") != std::string::npos ||
                         sentence.find(" does not exist.") != std::string::npos;
    return message_page(unknown ? 404 : 400, unknown ? "Not found" : "Refused", sentence, visitor);
  } catch (const StorageError& e) {
    return message_page(500, "Storage error", e.what(), visitor);
  }
}

}  // namespace plumb::web
