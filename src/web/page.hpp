#pragma once
// One request and one response as the pages see them, without the HTTP library: the pages are plain functions
// from a request to a response, calling app/ and report/ only (no SQL, validation or metrology here).
#include <map>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "app/people/authenticate.hpp"
#include "web/serve_options.hpp"

namespace plumb::web {

/// A file sent with a multipart form (an <input type="file">): its name as the browser gave it, and its bytes.
struct UploadedFile {
  std::string filename;
  std::string content;
};

struct WebRequest {
  std::string method;  ///< GET or POST
  std::string path;
  std::multimap<std::string, std::string> params;  ///< query and form fields
  std::map<std::string, std::string> cookies;
  std::map<std::string, UploadedFile> files;  ///< a multipart form's files, by field name (the first of a name)
  std::vector<std::string> path_parts;        ///< the route's captures, e.g. the instrument id
  std::string remote_addr;

  /// The first value of `name`, or empty.
  [[nodiscard]] std::string param(const std::string& name) const {
    const auto it = params.find(name);
    return it == params.end() ? std::string() : it->second;
  }
  [[nodiscard]] std::string cookie(const std::string& name) const {
    const auto it = cookies.find(name);
    return it == cookies.end() ? std::string() : it->second;
  }
};

struct WebResponse {
  int status = 200;
  std::string content_type = "text/html; charset=utf-8";
  std::string body;
  std::vector<std::pair<std::string, std::string>> headers;  ///< beside the security headers every response gets
  /// A Content-Security-Policy of its own (the certificate document's inline style, a chart image); empty: the
  /// site's.
  std::string csp;
};

/// What every page knows: the options, the secret that CSRF tokens are made with, and whether TLS is on.
struct Site {
  ServeOptions options;
  std::string secret;  ///< random per process: CSRF tokens of an earlier process are refused
  bool tls = false;
};

/// The user of a page, authenticated from the session cookie through app/people (never from a form field).
struct Visitor {
  app::Authenticated who;
  std::string token;  ///< the session token of the cookie
  std::string csrf;   ///< the token every form of this session carries
};

/// The name of the session cookie.
inline constexpr const char* session_cookie = "plumb_session";
/// The name of the cookie that pairs with the log-in form's CSRF token (there is no session yet).
inline constexpr const char* login_cookie = "plumb_login";

}  // namespace plumb::web
