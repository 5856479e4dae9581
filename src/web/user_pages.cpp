// The administrators' users page: the accounts with their roles and standing, and the account commands of
// `plumb user` (add, grant, revoke, deactivate, reactivate, unlock, reset-password) as forms calling the same app
// functions (app/people/accounts). As in the CLI, an administrator sets a new account's first password and a reset's
// temporary one (typed twice); the user must change it at the next log-in, so an administrator never knows a password
// that signs. Every other role gets 403 on the page and on every form.
#include <fmt/format.h>

#include <algorithm>
#include <regex>

#include "app/people/accounts.hpp"
#include "app/people/roles.hpp"
#include "core/errors.hpp"
#include "web/pages.hpp"
#include "web/render.hpp"
#include "web/visitor.hpp"

namespace plumb::web {
namespace {

using nlohmann::json;

constexpr app::Role every_role[] = {app::Role::technician, app::Role::reviewer, app::Role::quality_manager,
                                    app::Role::administrator};

/// Which field of the add form a refusal is about.
std::string new_user_field_at_fault(const std::string& sentence) {
  if (sentence.starts_with("user id")) return "login";
  if (sentence.starts_with("--name")) return "name";
  if (sentence.starts_with("--role")) return "role";
  if (sentence.find("password") != std::string::npos) return "password";
  return "form";
}

/// The two password fields of a form: the password, or InputError when they differ (the CLI asks twice as well).
std::string typed_twice(const PageContext& c) {
  std::string first = c.request.param("password");
  if (first != c.request.param("password_again"))
    throw InputError("the two passwords typed differ; nothing was changed.");
  return first;
}

/// The page, with a refusal beside its form: `account` is the login whose row the form was on, `field` that form
/// ("grant", "reset" ...); with `account` empty, `field` is the field of the add form.
WebResponse users_view(PageContext& c, const std::string& account, const std::string& field,
                       const std::string& sentence, int status, const std::string& done = "") {
  json rows = json::array();
  for (const auto& u : app::list_users(c.db)) {
    const bool mine = !account.empty() && u.user.login == account;
    json held = json::array(), other = json::array();
    for (const app::Role r : every_role) {
      const std::string name(app::role_name(r));
      if (std::find(u.roles.begin(), u.roles.end(), name) != u.roles.end())
        held.push_back(name);
      else
        other.push_back(name);
    }
    rows.push_back({{"login", u.user.login},
                    {"name", u.user.full_name},
                    {"roles", held},
                    {"other_roles", other},
                    {"active", u.active},
                    {"locked", u.locked},
                    {"standing", !u.active       ? "deactivated"
                                 : u.locked      ? "locked"
                                 : u.must_change ? "must change password"
                                                 : "active"},
                    {"self", u.user.login == c.visitor->who.login},
                    {"open", mine},
                    {"error_" + (mine ? field : std::string("none")), mine ? json(sentence) : json()}});
  }
  json roles = json::array();
  const auto typed_roles = c.request.params.equal_range("role");
  for (const app::Role r : every_role) {
    const std::string name(app::role_name(r));
    bool chosen = false;
    if (account.empty())
      for (auto it = typed_roles.first; it != typed_roles.second; ++it) chosen = chosen || it->second == name;
    roles.push_back({{"value", name}, {"checked", chosen}});
  }
  json context = {{"users", rows}, {"roles", roles}, {"done", done}};
  if (account.empty() && !sentence.empty()) {
    context["login"] = c.request.param("login");
    context["name"] = c.request.param("name");
    context[field + "_error"] = sentence;
  }
  return html_page("users", "Users", context, c.visitor, status);
}

/// A form on one account's row: `change` does it; a refusal comes back beside that form.
template <typename Change>
WebResponse account_change(PageContext& c, const char* command, const char* form, Change change) {
  require_role(*c.visitor, command);
  const std::string login = c.request.path_parts.at(0);
  try {
    change(login);
    return redirect_to("/users?done=" + login);
  } catch (const InputError& e) {
    return users_view(c, login, form, e.what(), 400);
  }
}

}  // namespace

WebResponse users_page(PageContext& c) {
  require_role(*c.visitor, "user add");
  static const std::regex plain_login("[a-z0-9._-]{1,64}");
  const std::string done = c.request.param("done");
  return users_view(c, "", "", "", 200, std::regex_match(done, plain_login) ? done : "");
}

WebResponse user_add_submit(PageContext& c) {
  require_role(*c.visitor, "user add");
  try {
    app::NewUser u;
    u.login = c.request.param("login");
    u.full_name = c.request.param("name");
    const auto typed = c.request.params.equal_range("role");
    for (auto it = typed.first; it != typed.second; ++it) u.roles.push_back(it->second);
    u.password = typed_twice(c);
    const auto user = app::add_user(c.db, c.visitor->who.actor, u);
    return redirect_to("/users?done=" + user.login);
  } catch (const InputError& e) {
    return users_view(c, "", new_user_field_at_fault(e.what()), e.what(), 400);
  }
}

WebResponse user_change_submit(PageContext& c) {
  const std::string action = c.request.path_parts.at(1);
  const auto& admin = c.visitor->who.actor;
  const std::string reason = c.request.param("reason"), role = c.request.param("role");
  if (action == "grant")
    return account_change(c, "user grant", "grant",
                          [&](const std::string& login) { app::grant_role(c.db, admin, login, role); });
  if (action == "revoke")
    return account_change(c, "user revoke", "revoke",
                          [&](const std::string& login) { app::revoke_role(c.db, admin, login, role, reason); });
  if (action == "deactivate")
    return account_change(c, "user deactivate", "deactivate",
                          [&](const std::string& login) { app::deactivate_user(c.db, admin, login, reason); });
  if (action == "reactivate")
    return account_change(c, "user reactivate", "reactivate",
                          [&](const std::string& login) { app::reactivate_user(c.db, admin, login, reason); });
  if (action == "unlock")
    return account_change(c, "user unlock", "unlock",
                          [&](const std::string& login) { app::unlock_user(c.db, admin, login, reason); });
  return account_change(c, "user reset-password", "reset",
                        [&](const std::string& login) { app::reset_password(c.db, admin, login, typed_twice(c)); });
}

}  // namespace plumb::web
