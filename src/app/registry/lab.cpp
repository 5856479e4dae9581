#include "app/registry/lab.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include "app/registry/fields.hpp"
#include "core/errors.hpp"
#include "store/created_file.hpp"
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
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  if (auto lab = store::find_lab(db.sql()))
    throw InputError(fmt::format("database \"{}\" is already set up for lab \"{}\".", db.path().string(), lab->name));
  store::Recorder rec(db.sql(), actor);
  store::add_lab(rec, name);
  tx.commit();
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
  const store::Actor actor = add_first_administrator(db, admin);
  init_lab(db, actor, name);
  file.keep();
  return true;
}

}  // namespace plumb::app
