#pragma once
// The web application's defences that are not the accounts' own (those are app/people's): CSRF tokens, the
// security headers of every response, the session cookie's attributes, and a limit on log-in attempts per client
// address on top of the accounts' lock-out.
#include <chrono>
#include <deque>
#include <map>
#include <mutex>
#include <string>
#include <utility>
#include <vector>

namespace plumb::web {

/// 32 random bytes as hex (OpenSSL's RAND_bytes).
std::string random_hex_token();
/// HMAC-SHA256 of `purpose` and `value` under `secret`, as hex: a CSRF token bound to a session (or to the log-in
/// form's cookie) that nobody without the secret can make.
std::string keyed_token(const std::string& secret, const std::string& purpose, const std::string& value);
/// Compares two tokens in constant time.
bool same_token(const std::string& a, const std::string& b);

/// The Content-Security-Policy of every page: nothing inline, nothing from elsewhere, never in a frame.
inline constexpr const char* site_csp =
    "default-src 'self'; script-src 'self'; style-src 'self'; img-src 'self'; form-action 'self'; "
    "base-uri 'none'; frame-ancestors 'none'";
/// The headers every response carries (with its Content-Security-Policy `csp`).
std::vector<std::pair<std::string, std::string>> security_headers(const std::string& csp, bool tls);

/// Set-Cookie for the session: HttpOnly, SameSite=Strict, Path=/, Secure under TLS; no Max-Age (it ends with the
/// browser, and the server ends it after the lab's idle time).
std::string cookie_header(const std::string& name, const std::string& value, bool tls);
/// Set-Cookie that removes the cookie `name`.
std::string expired_cookie_header(const std::string& name, bool tls);

/// At most `per_minute` log-in attempts from one client address in any 60 seconds.
class LoginLimiter {
 public:
  explicit LoginLimiter(int per_minute) : per_minute_(per_minute) {}
  /// Counts an attempt from `address`; false when it is over the limit (the attempt is then not made).
  bool allow(const std::string& address, std::chrono::steady_clock::time_point now);

 private:
  int per_minute_;
  std::mutex mutex_;
  std::map<std::string, std::deque<std::chrono::steady_clock::time_point>> attempts_;
};

}  // namespace plumb::web
