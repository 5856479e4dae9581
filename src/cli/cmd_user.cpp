#include <fmt/ostream.h>
#include <fmt/ranges.h>

#include <nlohmann/json.hpp>

#include "app/people/accounts.hpp"
#include "cli/command_groups.hpp"
#include "core/errors.hpp"

namespace plumb::cli {
namespace {

/// A new password for someone: from --new-password-file, else asked twice at the terminal.
std::string new_password(const po::variables_map& vm, const std::string& whose) {
  PasswordSource source;
  if (vm.count("new-password-file")) source.file = vm["new-password-file"].as<std::string>();
  const auto first = read_password(source, fmt::format("plumb: new password of {}: ", whose));
  if (!first)
    throw InputError("--new-password-file FILE must give the new password (or run at a terminal to type it).");
  if (!source.file) {
    const auto again = read_password(source, "plumb: the same password again: ");
    if (!again || *again != *first) throw InputError("the two passwords typed differ; nothing was changed.");
  }
  return *first;
}

void add_new_password_option(po::options_description& d) {
  d.add_options()("new-password-file", po::value<std::string>(),
                  "FILE (mode 0600) whose first line is the new password; else it is asked at the terminal");
}

Command account_command(const std::string& verb, const std::string& summary, const std::string& example,
                        bool needs_reason,
                        void (*change)(store::Database&, const store::Actor&, const std::string&, const std::string&),
                        const std::string& done) {
  return {"user",
          verb,
          summary,
          example,
          [needs_reason](po::options_description& d, po::positional_options_description& p) {
            d.add_options()("id", po::value<std::string>()->required(), "user id (positional)");
            if (needs_reason) d.add_options()("reason", po::value<std::string>(), "why (required; recorded)");
            p.add("id", 1);
          },
          [change, done, needs_reason](const po::variables_map& vm, Env& env) {
            if (needs_reason && !vm.count("reason")) throw InputError("--reason must say why (it is recorded).");
            auto db = env.open();
            const auto admin = env.actor(db);
            const std::string id = vm["id"].as<std::string>();
            change(db, admin, id, needs_reason ? vm["reason"].as<std::string>() : "");
            fmt::print(env.out, "User {} {}.\n", id, done);
            return 0;
          }};
}

}  // namespace

std::vector<Command> user_commands() {
  Command add{"user",
              "add",
              "add a user account with its roles (an administrator's command); its first password "
              "must be changed at the first log-in",
              "plumb user add ptech --name \"Priya Tech\" --role technician --new-password-file first.pw",
              [](po::options_description& d, po::positional_options_description& p) {
                d.add_options()("id", po::value<std::string>()->required(),
                                "the new user id (positional; never reused)")(
                    "name", po::value<std::string>()->required(), "full (printed) name")(
                    "role", po::value<std::vector<std::string>>(),
                    "technician|reviewer|quality-manager|administrator (repeat for several)");
                add_new_password_option(d);
                p.add("id", 1);
              },
              [](const po::variables_map& vm, Env& env) {
                app::NewUser u;
                u.login = vm["id"].as<std::string>();
                u.full_name = vm["name"].as<std::string>();
                if (vm.count("role")) u.roles = vm["role"].as<std::vector<std::string>>();
                auto db = env.open();
                const auto admin = env.actor(db);
                u.password = new_password(vm, u.login);
                const auto user = app::add_user(db, admin, u);
                fmt::print(env.out,
                           "User {} ({}) added with the role(s) {}; the password must be changed at the first "
                           "log-in.\n",
                           user.login, user.full_name, fmt::join(u.roles, ", "));
                return 0;
              }};
  Command list{
      "user",
      "list",
      "list the user accounts with their roles and standing",
      "plumb user list --format json",
      [](po::options_description& d, po::positional_options_description&) { add_format_option(d); },
      [](const po::variables_map& vm, Env& env) {
        const auto format = format_of(vm, {"text", "json"});
        auto db = env.open();
        const auto users = app::list_users(db);
        const auto settings = store::security_settings(db.sql());
        if (format == "json") {
          nlohmann::json j = nlohmann::json::array();
          for (const auto& u : users)
            j.push_back({{"user_id", u.user.id},
                         {"id", u.user.login},
                         {"name", u.user.full_name},
                         {"roles", u.roles},
                         {"active", u.active},
                         {"locked", u.locked},
                         {"must_change_password", u.must_change},
                         {"created_at", u.user.created_at}});
          env.out << nlohmann::json{{"users", j}, {"password_hashing", settings.password_hashing}}.dump(2) << "\n";
          return 0;
        }
        for (const auto& u : users)
          fmt::print(env.out, "{:<4}{:<16}{:<28}{:<36}{}\n", u.user.id, u.user.login, u.user.full_name,
                     fmt::format("{}", fmt::join(u.roles, ", ")),
                     !u.active       ? "deactivated"
                     : u.locked      ? "locked"
                     : u.must_change ? "must change password"
                                     : "active");
        if (settings.password_hashing == "test-only-fast")
          fmt::print(env.out,
                     "Passwords in this database are hashed with test-only fast limits: never keep "
                     "records in it.\n");
        return 0;
      }};
  Command grant{"user",
                "grant",
                "grant a role to a user (an administrator's command; recorded)",
                "plumb user grant ptech --role reviewer",
                [](po::options_description& d, po::positional_options_description& p) {
                  d.add_options()("id", po::value<std::string>()->required(), "user id (positional)")(
                      "role", po::value<std::string>()->required(),
                      "technician|reviewer|quality-manager|administrator");
                  p.add("id", 1);
                },
                [](const po::variables_map& vm, Env& env) {
                  auto db = env.open();
                  app::grant_role(db, env.actor(db), vm["id"].as<std::string>(), vm["role"].as<std::string>());
                  fmt::print(env.out, "User {} now holds the role {}.\n", vm["id"].as<std::string>(),
                             vm["role"].as<std::string>());
                  return 0;
                }};
  Command revoke{"user",
                 "revoke",
                 "revoke a role from a user (an administrator's command; recorded)",
                 "plumb user revoke ptech --role reviewer --reason \"moved to another lab\"",
                 [](po::options_description& d, po::positional_options_description& p) {
                   d.add_options()("id", po::value<std::string>()->required(), "user id (positional)")(
                       "role", po::value<std::string>()->required(), "the role to revoke")(
                       "reason", po::value<std::string>(), "why (required; recorded)");
                   p.add("id", 1);
                 },
                 [](const po::variables_map& vm, Env& env) {
                   if (!vm.count("reason")) throw InputError("--reason must say why the role is revoked.");
                   auto db = env.open();
                   app::revoke_role(db, env.actor(db), vm["id"].as<std::string>(), vm["role"].as<std::string>(),
                                    vm["reason"].as<std::string>());
                   fmt::print(env.out, "User {} no longer holds the role {}.\n", vm["id"].as<std::string>(),
                              vm["role"].as<std::string>());
                   return 0;
                 }};
  Command reset{"user",
                "reset-password",
                "give a user a temporary password, to be changed at the next log-in (an administrator's command)",
                "plumb user reset-password ptech --new-password-file temporary.pw",
                [](po::options_description& d, po::positional_options_description& p) {
                  d.add_options()("id", po::value<std::string>()->required(), "user id (positional)");
                  add_new_password_option(d);
                  p.add("id", 1);
                },
                [](const po::variables_map& vm, Env& env) {
                  auto db = env.open();
                  const auto admin = env.actor(db);
                  const std::string id = vm["id"].as<std::string>();
                  app::reset_password(db, admin, id, new_password(vm, id));
                  fmt::print(env.out, "User {} has a temporary password; it must be changed at the next log-in.\n", id);
                  return 0;
                }};
  Command password{"user",
                   "password",
                   "change your own password (after giving the current one)",
                   "plumb --user ptech --password-file old.pw user password --new-password-file new.pw",
                   [](po::options_description& d, po::positional_options_description&) { add_new_password_option(d); },
                   [](const po::variables_map& vm, Env& env) {
                     auto db = env.open();
                     const auto me = env.authenticated(db);
                     if (!me.password_entered)
                       throw AccessError(
                           "changing a password needs the current one: give --user ID with "
                           "--password-file FILE or --password-stdin, or run at a terminal.");
                     app::change_own_password(db, me.actor, new_password(vm, me.login));
                     fmt::print(env.out, "The password of {} is changed.\n", me.login);
                     return 0;
                   }};
  Command policy{"user",
                 "policy",
                 "the lab's password and session rules (an administrator's command; recorded)",
                 "plumb user policy --min-length 14 --lock-after 5 --idle-minutes 15 --max-age-days 180",
                 [](po::options_description& d, po::positional_options_description&) {
                   d.add_options()("min-length", po::value<int>(), "minimum password length in characters (8-128)")(
                       "lock-after", po::value<int>(), "failed log-ins in a row that lock an account (1-100)")(
                       "idle-minutes", po::value<int>(), "minutes of idleness that end a session (1-1440)")(
                       "max-age-days", po::value<int>(), "days after which a password must be changed")(
                       "no-ageing", po::bool_switch(), "passwords do not age");
                 },
                 [](const po::variables_map& vm, Env& env) {
                   app::PolicyChange c;
                   if (vm.count("min-length")) c.min_password_length = vm["min-length"].as<int>();
                   if (vm.count("lock-after")) c.max_failed_logins = vm["lock-after"].as<int>();
                   if (vm.count("idle-minutes")) c.idle_minutes = vm["idle-minutes"].as<int>();
                   if (vm.count("max-age-days")) c.password_max_age_days = vm["max-age-days"].as<int>();
                   c.no_password_ageing = vm["no-ageing"].as<bool>();
                   if (c.no_password_ageing && c.password_max_age_days)
                     throw InputError("--no-ageing and --max-age-days contradict each other; give one.");
                   auto db = env.open();
                   const auto s = app::set_policy(db, env.actor(db), c);
                   fmt::print(env.out,
                              "Passwords: at least {} characters, {}; {} failed log-ins lock an account; sessions end "
                              "after {} minutes idle.\n",
                              s.min_password_length,
                              s.password_max_age_days ? fmt::format("changed every {} days", *s.password_max_age_days)
                                                      : std::string("no ageing"),
                              s.max_failed_logins, s.idle_minutes);
                   return 0;
                 }};
  return {add,
          list,
          grant,
          revoke,
          account_command("deactivate", "deactivate an account (it stays, and cannot log in; recorded)",
                          "plumb user deactivate ptech --reason \"left the lab\"", true, app::deactivate_user,
                          "is deactivated"),
          account_command("reactivate", "reactivate a deactivated account (recorded)",
                          "plumb user reactivate ptech --reason \"back from leave\"", true, app::reactivate_user,
                          "is active again"),
          account_command("unlock", "unlock an account locked after failed log-ins (recorded)",
                          "plumb user unlock ptech --reason \"identity confirmed in person\"", true, app::unlock_user,
                          "is unlocked"),
          reset,
          password,
          policy};
}

std::vector<Command> login_commands() {
  Command login{"login",
                "",
                "open a session: later commands on this database run as you until `plumb logout` or the "
                "lab's idle time",
                "plumb --db lab.db login --user ptech",
                [](po::options_description& d, po::positional_options_description&) {
                  d.add_options()("user", po::value<std::string>(), "your user id");
                },
                [](const po::variables_map& vm, Env& env) {
                  auto db = env.open();
                  app::Credentials c = env.credentials();
                  if (vm.count("user")) c.login = vm["user"].as<std::string>();
                  const auto s = app::open_session(db, c);
                  write_session_token(env.db_path, s.token);
                  fmt::print(env.out, "Logged in as {} ({}); the session ends after {} minutes idle.\n", s.login,
                             s.full_name, s.idle_minutes);
                  return 0;
                }};
  Command logout{"logout",
                 "",
                 "end your session on this database",
                 "plumb --db lab.db logout",
                 [](po::options_description&, po::positional_options_description&) {},
                 [](const po::variables_map&, Env& env) {
                   auto db = env.open();
                   const auto token = read_session_token(env.db_path);
                   const bool ended = token && app::close_session(db, *token);
                   remove_session_token(env.db_path);
                   env.out << (ended ? "Logged out.\n" : "There was no open session; nothing to end.\n");
                   return 0;
                 }};
  return {login, logout};
}

}  // namespace plumb::cli
