#include "app/people/authenticate.hpp"

#include <SQLiteCpp/Transaction.h>

#include <fmt/format.h>
#include <filesystem>

#include "app/people/account_state.hpp"
#include "app/people/password_hash.hpp"
#include "app/people/permissions.hpp"
#include "core/errors.hpp"
#include "store/lab_key.hpp"
#include "store/users.hpp"

namespace plumb::app {
namespace {

constexpr const char* how_to_log_in =
    "run `plumb login`, or give --user ID with --password-file FILE or --password-stdin";

/// A failed attempt, in a transaction of its own (the command itself writes nothing): at the lab's limit the
/// account is locked, and that too is recorded.
void record_failure(store::Database& db, const store::UserRecord& user, const store::SecuritySettings& settings) {
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  const AccountState before = account_state(store::account_events(db.sql(), user.id));
  store::Recorder rec(db.sql(), {"failed log-in attempt for " + user.login, store::current_os_user(), std::nullopt});
  store::add_account_event(rec, user.id, "failed log-in");
  if (!before.locked && before.failures + 1 >= settings.max_failed_logins)
    store::add_account_event(rec, user.id, "locked", "",
                             fmt::format("{} failed log-ins in a row", settings.max_failed_logins));
  rec.commit(tx);
}

void record_success_after_failures(store::Database& db, const store::UserRecord& user) {
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::Recorder rec(db.sql(), {user.full_name, store::current_os_user(), user.id});
  store::add_account_event(rec, user.id, "logged in");
  rec.commit(tx);
}

struct SessionUser {
  store::SessionRecord session;
  store::UserRecord user;
};

/// The session of `token`, when it is open and not idle; an idle one is ended (recorded) and refused.
std::optional<SessionUser> live_session(store::Database& db, const std::string& token, const std::string& now) {
  const auto s = store::find_session_by_token_hash(db.sql(), store::sha256_hex(token));
  if (!s || s->ended_at) return std::nullopt;
  const auto user = store::find_user(db.sql(), s->user_id);
  if (!user) return std::nullopt;
  if (session_idle(s->last_used_at, s->idle_minutes, now)) {
    SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
    store::Recorder rec(db.sql(), {user->full_name, store::current_os_user(), user->id});
    store::end_session(rec, s->id, "idle");
    rec.commit(tx);
    throw AccessError(
        fmt::format("the session of {} ended after more than {} minutes idle (last used {}); log in "
                    "again with `plumb login`.",
                    user->login, s->idle_minutes, s->last_used_at));
  }
  return SessionUser{*s, *user};
}

/// The account's standing for `command`: AccessError when it may not act at all.
AccountState usable_account(store::Database& db, const store::UserRecord& user, const std::string& command,
                            const store::SecuritySettings& settings, const std::string& now) {
  AccountState state = account_state(store::account_events(db.sql(), user.id));
  if (!state.active) throw AccessError(fmt::format("the account {} is deactivated; it cannot log in.", user.login));
  if (state.locked)
    throw AccessError(
        fmt::format("the account {} is locked after {} failed log-ins; an administrator must unlock it "
                    "(`plumb user unlock {}`).",
                    user.login, settings.max_failed_logins, user.login));
  if (command != "user password") {
    const auto pw = store::current_password(db.sql(), user.id);
    if (pw && pw->must_change)
      throw AccessError(
          fmt::format("the password of {} was set by an administrator and must be changed before "
                      "anything else: `plumb --user {} user password`.",
                      user.login, user.login));
    if (pw && password_expired(pw->set_at, settings.password_max_age_days, now))
      throw AccessError(
          fmt::format("the password of {} is older than the lab's limit of {} days; change it with "
                      "`plumb --user {} user password`.",
                      user.login, *settings.password_max_age_days, user.login));
  }
  return state;
}

/// Checks `password` for `login`; AccessError (and a recorded failure) when it is wrong. The same sentence for an
/// unknown login and a wrong password.
store::UserRecord check_password(store::Database& db, const std::string& login, const std::string& password,
                                 const store::SecuritySettings& settings) {
  const auto user = store::find_user_by_login(db.sql(), login);
  const auto pw = user ? store::current_password(db.sql(), user->id) : std::nullopt;
  const std::string refused = fmt::format("the user id or password is wrong (user {}).", login);
  if (!user || !pw) {
    spend_password_check_time(password, settings.password_hashing);
    throw AccessError(refused);
  }
  const AccountState state = account_state(store::account_events(db.sql(), user->id));
  if (state.locked)  // checked first: a locked account takes no more guesses
    throw AccessError(
        fmt::format("the account {} is locked after {} failed log-ins; an administrator must unlock it "
                    "(`plumb user unlock {}`).",
                    user->login, settings.max_failed_logins, user->login));
  if (!password_matches(pw->hash, password)) {
    record_failure(db, *user, settings);
    throw AccessError(refused);
  }
  if (state.failures > 0) record_success_after_failures(db, *user);
  return *user;
}

}  // namespace

Authenticated authenticate(store::Database& db, const std::string& command, const Credentials& credentials) {
  const Permission* permission = permission_of(command);
  if (!permission)
    throw AccessError(fmt::format("`plumb {}` is not in the table of permissions; nobody may run it.", command));
  const auto settings = store::security_settings(db.sql());
  const std::string now = store::utc_timestamp();
  if (store::count_users(db.sql()) == 0)
    throw AccessError(fmt::format(
        "database \"{}\" has no user accounts yet; {}add its first administrator with `plumb --db {} init --admin ID "
        "--admin-name \"FULL NAME\"`.",
        db.path().string(),
        std::filesystem::exists(store::key_path_for(db.path())) ? ""
                                                                : "create the lab's key with `plumb key create`, then ",
        db.path().string()));

  std::optional<SessionUser> session;
  if (credentials.session_token) session = live_session(db, *credentials.session_token, now);
  const bool other_user = credentials.login && session && session->user.login != *credentials.login;
  if (other_user) session.reset();

  Authenticated out;
  store::UserRecord user;
  if (!session || credentials.login || permission->signs) {
    const std::optional<std::string> login = credentials.login ? credentials.login
                                             : session         ? std::optional(session->user.login)
                                                               : std::nullopt;
    if (!login) throw AccessError(fmt::format("`plumb {}` needs a logged-in user: {}.", command, how_to_log_in));
    const auto password = credentials.password ? credentials.password(*login) : std::nullopt;
    if (!password)
      throw AccessError(permission->signs && session
                            ? fmt::format("`plumb {}` is an electronic signature: enter your password again for it "
                                          "(at the terminal, or with --password-file FILE or --password-stdin).",
                                          command)
                            : fmt::format("`plumb {}` needs the password of {}: {}.", command, *login, how_to_log_in));
    user = check_password(db, *login, *password, settings);
    out.password_entered = true;
  } else {
    user = session->user;
  }
  const AccountState state = usable_account(db, user, command, settings, now);
  require_permission(command, state.roles, user.login);
  // Times are to the second: a session whose stored use is this second keeps it, and the page takes no write lock
  // (a browser's requests come several to a second; each write would wait behind the lab's recording).
  if (session && session->user.id == user.id && !(session->session.used && session->session.last_used_at == now))
    store::touch_session(db.sql(), session->session.id, now);
  out.actor = {user.full_name, store::current_os_user(), user.id};
  out.login = user.login;
  out.roles = state.roles;
  return out;
}

OpenedSession open_session(store::Database& db, const Credentials& credentials) {
  Credentials fresh = credentials;
  fresh.session_token.reset();  // a log-in always asks for the password
  if (!fresh.login) throw InputError("--user must name the user id to log in as.");
  const Authenticated who = authenticate(db, "login", fresh);
  const auto settings = store::security_settings(db.sql());
  OpenedSession out;
  out.token = new_session_token();
  out.login = who.login;
  out.full_name = who.actor.name;
  out.idle_minutes = settings.idle_minutes;
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::Recorder rec(db.sql(), who.actor);
  store::add_session(rec, *who.actor.user_id, store::sha256_hex(out.token), settings.idle_minutes);
  rec.commit(tx);
  return out;
}

bool close_session(store::Database& db, const std::string& token) {
  const auto s = store::find_session_by_token_hash(db.sql(), store::sha256_hex(token));
  if (!s || s->ended_at) return false;
  const auto user = store::find_user(db.sql(), s->user_id);
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::Recorder rec(db.sql(), {user ? user->full_name : "unknown", store::current_os_user(), s->user_id});
  store::end_session(rec, s->id, "logged out");
  rec.commit(tx);
  return true;
}

}  // namespace plumb::app
