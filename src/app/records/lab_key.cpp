#include "app/records/lab_key.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include "core/errors.hpp"
#include "store/created_file.hpp"
#include "store/lab_key.hpp"

namespace plumb::app {

LabKeyFiles ensure_lab_key(const std::filesystem::path& db) {
  LabKeyFiles files;
  files.key = store::key_path_for(db);
  files.public_key = store::public_key_path_for(files.key);
  if (std::filesystem::exists(files.key)) {
    files.fingerprint = store::key_fingerprint(store::LabKey::load(files.key).public_hex());
    return files;
  }
  const auto key = store::LabKey::generate();
  key.save(files.key, files.public_key);
  files.fingerprint = store::key_fingerprint(key.public_hex());
  files.created = true;
  return files;
}

KeyCreation create_lab_key(store::Database& db, const store::Actor& actor) {
  KeyCreation out;
  const auto key_file = store::key_path_for(db.path());
  if (std::filesystem::exists(key_file))
    throw InputError(
        fmt::format("the lab's key \"{}\" exists already; plumb never replaces a key.", key_file.string()));
  if (const auto last = store::latest_checkpoint(db.sql()))
    throw InputError(
        fmt::format("database \"{}\" has {} signed checkpoints, signed with key {}; a new key cannot "
                    "continue them (set PLUMB_KEY to the file of that key).",
                    db.path().string(), last->number, store::key_fingerprint(last->public_key)));
  store::CreatedFileGuard key_guard(key_file);
  store::CreatedFileGuard public_guard(store::public_key_path_for(key_file));
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  out.files = ensure_lab_key(db.path());
  store::Recorder rec(db.sql(), actor);
  rec.commit(tx);
  out.first = store::latest_checkpoint(db.sql());
  key_guard.keep();
  public_guard.keep();
  return out;
}

}  // namespace plumb::app
