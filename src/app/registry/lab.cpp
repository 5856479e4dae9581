#include "app/registry/lab.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include "core/errors.hpp"
#include "store/repository.hpp"

namespace plumb::app {

store::LabRecord require_lab(store::Database& db) {
  auto lab = store::find_lab(db.sql());
  if (!lab)
    throw InputError(fmt::format("database \"{}\" has no lab yet; run `plumb --db {} init --lab NAME` first.",
                                 db.path().string(), db.path().string()));
  return *lab;
}

void init_lab(store::Database& db, const store::Actor& actor, const std::string& name) {
  if (name.empty() || name.size() > 200) throw InputError("--lab must name the laboratory (1-200 characters).");
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  if (auto lab = store::find_lab(db.sql()))
    throw InputError(fmt::format("database \"{}\" is already set up for lab \"{}\".", db.path().string(), lab->name));
  store::Recorder rec(db.sql(), actor);
  store::add_lab(rec, name);
  tx.commit();
}

}  // namespace plumb::app
