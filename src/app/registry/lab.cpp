#include "app/registry/lab.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include "app/records/lab_key.hpp"
#include "app/registry/fields.hpp"
#include "core/errors.hpp"
#include "store/created_file.hpp"
#include "store/lab_key.hpp"
#include "store/repository.hpp"
#include "store/users.hpp"

namespace plumb::app {

store::LabRecord require_lab(store::Database& db) {
  auto lab = store::find_lab(db.sql());
  if (!lab)
    throw InputError(fmt::format("database \"{}\" has no lab yet; run `plumb --db {} init --lab NAME` first.",
                                 db.path().string(), db.path().string()));
  return *lab;
}

namespace {

void validate_lab_name(const std::string& name) {
  validate_free_text(name, "--lab");
  if (name.size() > 200) throw InputError("--lab must name the laboratory (1-200 characters).");
}

}  // namespace

void init_lab(store::Database& db, const store::Actor& actor, const std::string& name) {
  validate_lab_name(name);
  // The lab's signing key is made with the lab (or an existing one, named by PLUMB_KEY, is used); a failed init
  // leaves no key behind.
  const auto key_file = store::key_path_for(db.path());
  store::CreatedFileGuard key_guard(key_file);
  store::CreatedFileGuard public_guard(store::public_key_path_for(key_file));
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  if (auto lab = store::find_lab(db.sql()))
    throw InputError(fmt::format("database \"{}\" is already set up for lab \"{}\".", db.path().string(), lab->name));
  ensure_lab_key(db.path());
  store::Recorder rec(db.sql(), actor);
  store::add_lab(rec, name);
  rec.commit(tx);
  key_guard.keep();
  public_guard.keep();
}

bool create_lab(const std::filesystem::path& path, const NewUser& admin, const std::string& name) {
  if (std::filesystem::exists(path)) {
    store::Database db(path, store::Database::Open::existing);
    if (store::find_lab(db.sql()) && store::count_users(db.sql()) == 0) {
      add_first_administrator(db, admin);
      return false;
    }
  }
  validate_lab_name(name);
  store::CreatedFileGuard file(path);
  store::Database db(path, store::Database::Open::create);
  if (auto lab = store::find_lab(db.sql()))
    throw InputError(fmt::format("database \"{}\" is already set up for lab \"{}\".", db.path().string(), lab->name));
  // The administrator's records are the first ones signed, so the lab's key is there before them (init_lab then
  // finds it); a failed init leaves neither key nor database behind.
  const auto key_file = store::key_path_for(db.path());
  store::CreatedFileGuard key_guard(key_file);
  store::CreatedFileGuard public_guard(store::public_key_path_for(key_file));
  ensure_lab_key(db.path());
  // One transaction: the administrator and the lab are recorded together, or neither.
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::Recorder rec(db.sql(), first_administrator(db, admin));
  record_first_administrator(db, rec, admin);
  store::add_lab(rec, name);
  rec.commit(tx);
  key_guard.keep();
  public_guard.keep();
  file.keep();
  return true;
}

}  // namespace plumb::app
