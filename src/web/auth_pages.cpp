// Log-in, log-out and the forced password change, through app/people: the same accounts, Argon2id passwords,
// lock-out and sessions as `plumb login`.
#include <algorithm>

#include "app/people/accounts.hpp"
#include "app/people/authenticate.hpp"
#include "core/errors.hpp"
#include "web/pages.hpp"
#include "web/render.hpp"
#include "web/visitor.hpp"

namespace plumb::web {
namespace {

/// The password typed into a form, handed to app/people as a front end's way of asking for it.
std::function<std::optional<std::string>(const std::string&)> typed_password(const std::string& password) {
  return [password](const std::string&) -> std::optional<std::string> {
    if (password.empty()) return std::nullopt;
    return password;
  };
}

/// The log-in form (or the password change form) with a fresh CSRF pair: a random cookie and the token made
/// from it, since there is no session yet to bind the token to.
WebResponse auth_form(PageContext& c, const std::string& name, nlohmann::json context, int status) {
  const std::string pairing = random_hex_token();
  context["csrf"] = keyed_token(c.site.secret, "login", pairing);
  auto r = html_page(name, name == "login" ? "Log in" : "Change your password", std::move(context), nullptr, status);
  r.headers.emplace_back("Set-Cookie", cookie_header(login_cookie, pairing, c.site.tls));
  return r;
}

bool login_csrf_valid(const PageContext& c) {
  const std::string pairing = c.request.cookie(login_cookie);
  return !pairing.empty() && same_token(c.request.param("csrf"), keyed_token(c.site.secret, "login", pairing));
}

WebResponse refused_form_token(const PageContext& c) {
  return message_page(403, "Form refused",
                      "The form's security token is missing or does not belong to this browser; reload the page and "
                      "try again.",
                      c.visitor);
}

}  // namespace

WebResponse login_form(PageContext& c) {
  if (c.visitor) return redirect_to("/");
  nlohmann::json context = nlohmann::json::object();
  if (c.request.param("changed") == "1") context["notice"] = "Your password was changed. Log in with the new one.";
  if (c.request.param("idle") == "1")
    context["notice"] = "Your session ended after the lab's idle time without use; log in again.";
  return auth_form(c, "login", context, 200);
}

WebResponse login_submit(PageContext& c) {
  if (!login_csrf_valid(c)) return refused_form_token(c);
  const std::string login = c.request.param("login");
  const std::string password = c.request.param("password");
  nlohmann::json context = {{"login", login}};
  if (!c.limiter.allow(c.request.remote_addr, std::chrono::steady_clock::now())) {
    context["password_error"] =
        "Too many log-in attempts from this address in the last minute; wait a minute and "
        "try again.";
    return auth_form(c, "login", context, 429);
  }
  try {
    // An account whose password an administrator set must change it first: it gets no session until then.
    const auto users = app::list_users(c.db);
    const auto account = std::find_if(users.begin(), users.end(), [&](const auto& u) { return u.user.login == login; });
    if (account != users.end() && account->must_change && account->active && !account->locked) {
      app::authenticate(c.db, "user password", {login, std::nullopt, typed_password(password)});
      return auth_form(
          c, "password",
          {{"login", login}, {"notice", "An administrator set your password: choose a new one before you go on."}},
          200);
    }
    const auto session = app::open_session(c.db, {login, std::nullopt, typed_password(password)});
    auto r = redirect_to("/");
    r.headers.emplace_back("Set-Cookie", cookie_header(session_cookie, session.token, c.site.tls));
    r.headers.emplace_back("Set-Cookie", expired_cookie_header(login_cookie, c.site.tls));
    return r;
  } catch (const InputError& e) {
    context["login_error"] = e.what();
  } catch (const AccessError& e) {
    context["password_error"] = e.what();
  }
  return auth_form(c, "login", context, 401);
}

WebResponse logout_submit(PageContext& c) {
  if (!c.visitor) return redirect_to("/login");
  if (!csrf_valid(*c.visitor, c.request)) return refused_form_token(c);
  app::close_session(c.db, c.visitor->token);
  auto r = redirect_to("/login");
  r.headers.emplace_back("Set-Cookie", expired_cookie_header(session_cookie, c.site.tls));
  return r;
}

WebResponse password_submit(PageContext& c) {
  if (!login_csrf_valid(c)) return refused_form_token(c);
  const std::string login = c.request.param("login");
  const std::string fresh = c.request.param("new_password");
  nlohmann::json context = {{"login", login}};
  if (!c.limiter.allow(c.request.remote_addr, std::chrono::steady_clock::now())) {
    context["current_error"] =
        "Too many log-in attempts from this address in the last minute; wait a minute and "
        "try again.";
    return auth_form(c, "password", context, 429);
  }
  try {
    const auto who =
        app::authenticate(c.db, "user password", {login, std::nullopt, typed_password(c.request.param("current"))});
    if (fresh != c.request.param("repeat")) {
      context["repeat_error"] = "The new password and its repetition differ.";
      return auth_form(c, "password", context, 400);
    }
    app::change_own_password(c.db, who.actor, fresh);
    return redirect_to("/login?changed=1");
  } catch (const InputError& e) {
    context["new_error"] = e.what();
  } catch (const AccessError& e) {
    context["current_error"] = e.what();
  }
  return auth_form(c, "password", context, 400);
}

}  // namespace plumb::web
