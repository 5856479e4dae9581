#include "app/people/accounts.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include <algorithm>

#include "app/people/account_state.hpp"
#include "app/people/password_hash.hpp"
#include "app/registry/fields.hpp"
#include "core/errors.hpp"
#include "core/text_field.hpp"

namespace plumb::app {
namespace {

void check_login(const std::string& login) {
  const bool fits = !login.empty() && login.size() <= 64 && std::all_of(login.begin(), login.end(), [](char c) {
    return (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') || c == '.' || c == '_' || c == '-';
  });
  if (!fits)
    throw InputError(
        fmt::format("user id \"{}\" must be 1-64 characters of a-z, 0-9, '.', '_' and '-'.", shown_on_one_line(login)));
}

/// Printed names must look like what they are: the spaces and invisible characters that make two names print
/// alike (U+00A0 no-break space, U+2000-U+200D spaces and zero-width characters, U+202F, U+205F-U+2064, U+3000,
/// U+FEFF) are refused, beside what core/text_field refuses everywhere.
void check_full_name(const std::string& name, const std::string& field) {
  validate_free_text(name, field);
  if (name.size() > 200) throw InputError(fmt::format("{} must be 1-200 characters.", field));
  static const std::vector<std::pair<std::string, std::string>> invisible = {
      {"\u00A0", "U+00A0 no-break space"},        {"\u200B", "U+200B zero-width space"},
      {"\u200C", "U+200C zero-width non-joiner"}, {"\u200D", "U+200D zero-width joiner"},
      {"\u202F", "U+202F narrow no-break space"}, {"\u2060", "U+2060 word joiner"},
      {"\u3000", "U+3000 ideographic space"},     {"\uFEFF", "U+FEFF zero-width no-break space"}};
  for (const auto& [bytes, what] : invisible)
    if (name.find(bytes) != std::string::npos)
      throw InputError(fmt::format("{} \"{}\" holds {}; a printed name may hold only ordinary spaces.", field,
                                   shown_on_one_line(name), what));
  for (char32_t c = 0x2000; c <= 0x200A; ++c) {
    std::string bytes = {static_cast<char>(0xE2), static_cast<char>(0x80), static_cast<char>(0x80 + (c - 0x2000))};
    if (name.find(bytes) != std::string::npos)
      throw InputError(
          fmt::format("{} \"{}\" holds a typographic space (U+{:04X}); a printed name may hold only "
                      "ordinary spaces.",
                      field, shown_on_one_line(name), static_cast<unsigned>(c)));
  }
  if (name.front() == ' ' || name.back() == ' ' || name.find("  ") != std::string::npos)
    throw InputError(fmt::format("{} \"{}\" must not start or end with a space or hold two in a row.", field, name));
}

store::UserRecord require_user(store::Database& db, const std::string& login) {
  check_login(login);
  auto u = store::find_user_by_login(db.sql(), login);
  if (!u) throw InputError(fmt::format("user id \"{}\" is not known (see `plumb user list`).", login));
  return *u;
}

std::size_t code_points(const std::string& s) {
  return static_cast<std::size_t>(
      std::count_if(s.begin(), s.end(), [](char c) { return (static_cast<unsigned char>(c) & 0xC0) != 0x80; }));
}

void refuse_self(const store::Actor& admin, const store::UserRecord& user, const std::string& what) {
  if (admin.user_id && *admin.user_id == user.id)
    throw AccessError(fmt::format("an administrator may not {} their own account ({}); another administrator must.",
                                  what, user.login));
}

void require_reason(const std::string& reason, const std::string& field) {
  validate_free_text(reason, field);
}

}  // namespace

void check_new_password(store::Database& db, const std::string& password, const std::string& field) {
  const auto settings = store::security_settings(db.sql());
  if (password.size() > 1024) throw InputError(fmt::format("{} is longer than 1,024 bytes.", field));
  if (const auto fault = text_fault(password))
    throw InputError(
        fmt::format("{} holds {} at character {}; choose another password.", field, fault->what, fault->character));
  if (code_points(password) < static_cast<std::size_t>(settings.min_password_length))
    throw InputError(fmt::format("{} is {} characters long; the lab's minimum is {}.", field, code_points(password),
                                 settings.min_password_length));
}

store::Actor first_administrator(store::Database& db, const NewUser& admin) {
  check_login(admin.login);
  check_full_name(admin.full_name, "--admin-name");
  if (store::count_users(db.sql()) > 0)
    throw InputError(
        fmt::format("database \"{}\" has user accounts already; its administrators add users with "
                    "`plumb user add`.",
                    db.path().string()));
  check_new_password(db, admin.password, "the administrator's password");
  // The new account writes its own records: its id is the next one users will give (ids are never reused).
  const std::int64_t id =
      db.sql().execAndGet("SELECT coalesce((SELECT seq FROM sqlite_sequence WHERE name = 'users'), 0) + 1").getInt64();
  return {admin.full_name, store::current_os_user(), id};
}

void record_first_administrator(store::Database& db, store::Recorder& rec, const NewUser& admin) {
  const std::int64_t id = *rec.actor().user_id;
  // A database from before user accounts holds records already: it always gets the production limits.
  const bool has_records = db.sql().execAndGet("SELECT count(*) FROM audit_log").getInt64() > 0;
  rec.insert("users", {{"id", id}, {"login", admin.login}, {"full_name", admin.full_name}, {"created_at", rec.now()}},
             {"id"});
  if (store::security_settings(db.sql()).set_at.empty()) {
    // The hashing is fixed here, once: the environment of a later command cannot weaken it.
    store::SecuritySettings settings;
    settings.password_hashing = has_records ? "moderate" : hashing_for_new_database();
    store::add_security_settings(rec, settings);
  }
  store::add_password(rec, id, hash_password(admin.password, store::security_settings(db.sql()).password_hashing),
                      false);
  store::add_account_event(rec, id, "role granted", std::string(role_name(Role::administrator)));
}

store::Actor add_first_administrator(store::Database& db, const NewUser& admin) {
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::Actor actor = first_administrator(db, admin);
  store::Recorder rec(db.sql(), actor);
  record_first_administrator(db, rec, admin);
  rec.commit(tx);
  return actor;
}

store::UserRecord add_user(store::Database& db, const store::Actor& admin, const NewUser& user) {
  check_login(user.login);
  check_full_name(user.full_name, "--name");
  if (user.roles.empty()) throw InputError("--role must name at least one role of the new user.");
  Roles roles;
  for (const auto& r : user.roles) roles.insert(parse_role(r, "--role"));
  if (roles.count(Role::administrator) && roles.size() > 1)
    throw InputError(
        "--role administrator cannot be combined with other roles: administrators manage accounts and "
        "nothing else.");
  check_new_password(db, user.password, "the new user's password");
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  if (auto existing = store::find_user_by_login(db.sql(), user.login))
    throw InputError(
        fmt::format("user id \"{}\" exists already ({}); user ids are never reused.", user.login, existing->full_name));
  store::Recorder rec(db.sql(), admin);
  const std::int64_t id = store::add_user(rec, user.login, user.full_name);
  store::add_password(rec, id, hash_password(user.password, store::security_settings(db.sql()).password_hashing), true);
  for (Role r : roles) store::add_account_event(rec, id, "role granted", std::string(role_name(r)));
  rec.commit(tx);
  return *store::find_user(db.sql(), id);
}

void grant_role(store::Database& db, const store::Actor& admin, const std::string& login, const std::string& role) {
  const Role r = parse_role(role, "--role");
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  const auto user = require_user(db, login);
  refuse_self(admin, user, "change the roles of");
  const AccountState state = account_state(store::account_events(db.sql(), user.id));
  if (state.roles.count(r)) throw InputError(fmt::format("user {} holds the role {} already.", login, role_name(r)));
  if ((r == Role::administrator && !state.roles.empty()) || state.roles.count(Role::administrator))
    throw InputError(
        "--role administrator cannot be combined with other roles: administrators manage accounts and "
        "nothing else.");
  store::Recorder rec(db.sql(), admin);
  store::add_account_event(rec, user.id, "role granted", std::string(role_name(r)));
  rec.commit(tx);
}

void revoke_role(store::Database& db, const store::Actor& admin, const std::string& login, const std::string& role,
                 const std::string& reason) {
  const Role r = parse_role(role, "--role");
  require_reason(reason, "--reason");
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  const auto user = require_user(db, login);
  refuse_self(admin, user, "change the roles of");
  const AccountState state = account_state(store::account_events(db.sql(), user.id));
  if (!state.roles.count(r)) throw InputError(fmt::format("user {} does not hold the role {}.", login, role_name(r)));
  store::Recorder rec(db.sql(), admin);
  store::add_account_event(rec, user.id, "role revoked", std::string(role_name(r)), reason);
  rec.commit(tx);
}

void deactivate_user(store::Database& db, const store::Actor& admin, const std::string& login,
                     const std::string& reason) {
  require_reason(reason, "--reason");
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  const auto user = require_user(db, login);
  refuse_self(admin, user, "deactivate");
  if (!account_state(store::account_events(db.sql(), user.id)).active)
    throw InputError(fmt::format("user {} is deactivated already.", login));
  store::Recorder rec(db.sql(), admin);
  store::add_account_event(rec, user.id, "deactivated", "", reason);
  rec.commit(tx);
}

void reactivate_user(store::Database& db, const store::Actor& admin, const std::string& login,
                     const std::string& reason) {
  require_reason(reason, "--reason");
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  const auto user = require_user(db, login);
  if (account_state(store::account_events(db.sql(), user.id)).active)
    throw InputError(fmt::format("user {} is active; only a deactivated account can be reactivated.", login));
  store::Recorder rec(db.sql(), admin);
  store::add_account_event(rec, user.id, "reactivated", "", reason);
  rec.commit(tx);
}

void unlock_user(store::Database& db, const store::Actor& admin, const std::string& login, const std::string& reason) {
  require_reason(reason, "--reason");
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  const auto user = require_user(db, login);
  if (!account_state(store::account_events(db.sql(), user.id)).locked)
    throw InputError(fmt::format("user {} is not locked.", login));
  store::Recorder rec(db.sql(), admin);
  store::add_account_event(rec, user.id, "unlocked", "", reason);
  rec.commit(tx);
}

void reset_password(store::Database& db, const store::Actor& admin, const std::string& login,
                    const std::string& temporary) {
  check_new_password(db, temporary, "the temporary password");
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  const auto user = require_user(db, login);
  refuse_self(admin, user, "reset the password of");
  store::Recorder rec(db.sql(), admin);
  store::add_password(rec, user.id, hash_password(temporary, store::security_settings(db.sql()).password_hashing),
                      true);
  if (account_state(store::account_events(db.sql(), user.id)).locked)
    store::add_account_event(rec, user.id, "unlocked", "", "password reset by an administrator");
  rec.commit(tx);
}

void change_own_password(store::Database& db, const store::Actor& user, const std::string& new_password) {
  check_new_password(db, new_password, "the new password");
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  const auto old = store::current_password(db.sql(), *user.user_id);
  if (old && password_matches(old->hash, new_password))
    throw InputError("the new password is the same as the old one; choose another.");
  store::Recorder rec(db.sql(), user);
  store::add_password(rec, *user.user_id,
                      hash_password(new_password, store::security_settings(db.sql()).password_hashing), false);
  rec.commit(tx);
}

store::SecuritySettings set_policy(store::Database& db, const store::Actor& admin, const PolicyChange& change) {
  store::SecuritySettings s = store::security_settings(db.sql());
  if (change.min_password_length) {
    if (*change.min_password_length < 8 || *change.min_password_length > 128)
      throw InputError(fmt::format("--min-length {} must be 8 to 128.", *change.min_password_length));
    s.min_password_length = *change.min_password_length;
  }
  if (change.max_failed_logins) {
    if (*change.max_failed_logins < 1 || *change.max_failed_logins > 100)
      throw InputError(fmt::format("--lock-after {} must be 1 to 100.", *change.max_failed_logins));
    s.max_failed_logins = *change.max_failed_logins;
  }
  if (change.idle_minutes) {
    if (*change.idle_minutes < 1 || *change.idle_minutes > 24 * 60)
      throw InputError(fmt::format("--idle-minutes {} must be 1 to 1440.", *change.idle_minutes));
    s.idle_minutes = *change.idle_minutes;
  }
  if (change.password_max_age_days) {
    if (*change.password_max_age_days < 1 || *change.password_max_age_days > 3650)
      throw InputError(fmt::format("--max-age-days {} must be 1 to 3650.", *change.password_max_age_days));
    s.password_max_age_days = *change.password_max_age_days;
  }
  if (change.no_password_ageing) s.password_max_age_days.reset();
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::Recorder rec(db.sql(), admin);
  store::add_security_settings(rec, s);  // password_hashing as it was: fixed when the database was created
  rec.commit(tx);
  return store::security_settings(db.sql());
}

std::vector<UserSummary> list_users(store::Database& db) {
  std::vector<UserSummary> out;
  for (const auto& u : store::all_users(db.sql())) {
    const AccountState st = account_state(store::account_events(db.sql(), u.id));
    UserSummary s{u, {}, st.active, st.locked, false};
    for (Role r : st.roles) s.roles.emplace_back(role_name(r));
    if (const auto pw = store::current_password(db.sql(), u.id)) s.must_change = pw->must_change;
    out.push_back(std::move(s));
  }
  return out;
}

}  // namespace plumb::app
