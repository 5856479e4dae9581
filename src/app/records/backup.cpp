#include "app/records/backup.hpp"

#include <SQLiteCpp/Backup.h>
#include <SQLiteCpp/Database.h>
#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>
#include <sqlite3.h>

#include <algorithm>

#include "core/errors.hpp"
#include "store/embedded.hpp"
#include "store/file_digest.hpp"
#include "store/lab_key.hpp"
#include "store/private_file.hpp"
#include "store/recorder.hpp"
#include "store/users.hpp"

namespace plumb::app {
namespace {

/// Copies all pages of `from` into `to` in steps, so that other connections are not locked out for the
/// whole copy; when another connection writes to the source meanwhile, SQLite restarts the copy itself.
void copy_pages(SQLite::Database& from, SQLite::Database& to) {
  SQLite::Backup backup(to, "main", from, "main");
  for (;;) {
    const int rc = backup.executeStep(512);
    if (rc == SQLITE_DONE) return;
    if (rc == SQLITE_BUSY || rc == SQLITE_LOCKED) sqlite3_sleep(25);
  }
}

int newest_schema() {
  int newest = 0;
  for (const auto& m : embedded::migrations()) newest = std::max(newest, std::stoi(std::string(m.name.substr(0, 3))));
  return newest;
}

std::string stamp_for_file_name() {
  std::string s = store::utc_timestamp();  // 2026-11-30T10:00:00Z
  std::erase(s, '-');
  std::erase(s, ':');
  return s;
}

}  // namespace

CopyCheck check_copy(const std::filesystem::path& path) {
  CopyCheck c;
  try {
    SQLite::Database db(path.string(), SQLite::OPEN_READONLY);
    c.integrity = db.execAndGet("PRAGMA integrity_check").getString();
    c.schema_version = db.execAndGet("PRAGMA user_version").getInt();
    if (c.integrity != "ok") {
      c.failure = fmt::format("\"{}\" fails SQLite's integrity check: {}", path.string(), c.integrity);
      return c;
    }
    if (!db.tableExists("audit_log") || c.schema_version < 1) {
      c.failure = fmt::format("\"{}\" is not a plumb database (it has no audit trail).", path.string());
      return c;
    }
    if (c.schema_version > newest_schema()) {
      c.failure = fmt::format("\"{}\" has schema version {}, newer than this plumb understands ({}).", path.string(),
                              c.schema_version, newest_schema());
      return c;
    }
    c.audit = store::verify_audit_trail(db);
    if (!c.audit.ok()) {
      c.failure = fmt::format("\"{}\" fails audit verification: {}", path.string(), c.audit.problems.front().message);
      return c;
    }
  } catch (const SQLite::Exception& e) {
    c.failure = fmt::format("\"{}\" cannot be read as a plumb database: {}.", path.string(), e.what());
    return c;
  }
  c.ok = true;
  return c;
}

BackupOutcome backup_database(store::Database& db, const std::filesystem::path& file, bool force) {
  if (file.empty()) throw InputError("backup FILE must name the file to write.");
  if (std::filesystem::exists(file) && !force)
    throw InputError(fmt::format("backup file \"{}\" already exists; choose another name or add --force to replace it.",
                                 file.string()));
  if (std::filesystem::exists(file) && std::filesystem::equivalent(file, db.path()))
    throw InputError(fmt::format("backup file \"{}\" is the database itself.", file.string()));
  const std::filesystem::path partial = file.string() + ".partial";
  std::filesystem::remove(partial);
  BackupOutcome out{file, {}};
  if (!store::create_private_file(partial))  // another backup to the same name is under way
    throw InputError(fmt::format("backup file \"{}\" is being written by another command.", partial.string()));
  try {
    SQLite::Database copy(partial.string(), SQLite::OPEN_READWRITE);
    copy_pages(db.sql(), copy);
    // One self-contained file: no write-ahead log beside the copy.
    copy.exec("PRAGMA journal_mode = DELETE");
  } catch (const SQLite::Exception& e) {
    std::filesystem::remove(partial);
    throw StorageError(fmt::format("backup to \"{}\" failed: {}", file.string(), e.what()));
  }
  out.check = check_copy(partial);
  if (!out.check.ok) {
    std::filesystem::remove(partial);
    return out;
  }
  std::filesystem::rename(partial, file);
  return out;
}

namespace {

std::string lab_text(const store::LabIdentity& lab, bool with_date) {
  return with_date ? fmt::format("\"{}\" (created {})", lab.name, lab.created_at) : fmt::format("\"{}\"", lab.name);
}

/// Refuses to put one lab's records in place of another's unless asked to in so many words.
void require_same_lab(const RestoreRequest& r, const std::optional<store::LabIdentity>& replaced,
                      const std::optional<store::LabIdentity>& backup) {
  if (!replaced || !backup || *replaced == *backup || r.other_lab) return;
  // Same name, different creation: two databases started apart, which the dates tell apart.
  const bool dates = replaced->name == backup->name;
  throw InputError(
      fmt::format("backup \"{}\" holds the records of lab {}, but database \"{}\" holds those of lab {}; "
                  "add --other-lab to replace one lab's records with the other's.",
                  r.file.string(), lab_text(*backup, dates), r.db_path.string(), lab_text(*replaced, dates)));
}

/// The restored trail goes on being signed with the key that signed the backup's checkpoints: another key would
/// leave a trail that no one public key proves.
void require_backup_key(const RestoreRequest& r, const std::optional<store::Checkpoint>& backup_checkpoint,
                        const std::string& key, const std::filesystem::path& key_file) {
  if (!backup_checkpoint || backup_checkpoint->public_key == key) return;
  throw InputError(
      fmt::format("backup \"{}\" was signed with key {}, but the key for database \"{}\" ({}) is key {}; "
                  "set PLUMB_KEY to the file of the backup's key.",
                  r.file.string(), store::key_fingerprint(backup_checkpoint->public_key), r.db_path.string(),
                  key_file.string(), store::key_fingerprint(key)));
}

void record_restore(store::Database& restored, const store::Actor& actor, const RestoreRequest& r,
                    const RestoreOutcome& out, const std::string& backup_sha256) {
  SQLite::Transaction tx(restored.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::Recorder rec(restored.sql(), actor);
  const auto& d = out.difference;
  rec.insert(
      "restores",
      {{"backup_file", std::filesystem::absolute(r.file).lexically_normal().string()},
       {"backup_sha256", backup_sha256},
       {"backup_records", d.second_records},
       {"backup_last_hash", d.second_last_hash.empty() ? store::genesis_hash() : d.second_last_hash},
       {"replaced_records", out.replaced_existing ? store::Value(d.first_records) : store::Value()},
       {"replaced_last_hash",
        out.replaced_existing && !d.first_last_hash.empty() ? store::Value(d.first_last_hash) : store::Value()},
       {"common_records", d.common},
       {"removed_records", out.replaced_existing ? d.first_only() : std::int64_t{0}},
       {"safety_copy", out.replaced_existing ? store::Value(out.previous_saved.string()) : store::Value()},
       {"reason", r.reason},
       {"by_name", actor.name},
       {"recorded_at", rec.now()},
       {"os_user", actor.os_user},
       {"backup_checkpoint", out.backup_checkpoint ? store::Value(out.backup_checkpoint->number) : store::Value()},
       {"backup_checkpoint_hash",
        out.backup_checkpoint ? store::Value(out.backup_checkpoint->head_hash) : store::Value()}},
      {"id"}, r.reason);
  rec.commit(tx);
}

}  // namespace

RestoreOutcome restore_database(const RestoreRequest& r, const std::function<store::Actor(store::Database&)>& who) {
  const auto& db_path = r.db_path;
  const auto& file = r.file;
  if (r.reason.find_first_not_of(" \t") == std::string::npos)
    throw InputError("--reason must say why the database is restored (it is recorded in the restored trail).");
  if (!std::filesystem::exists(file))
    throw InputError(fmt::format("restore FILE \"{}\" does not exist.", file.string()));
  const bool exists = std::filesystem::exists(db_path);
  if (exists && std::filesystem::equivalent(file, db_path))
    throw InputError(fmt::format("restore FILE \"{}\" is the database itself.", file.string()));
  if (exists && !r.force)
    throw InputError(
        fmt::format("database \"{}\" exists and restore would replace it; add --force (its present content "
                    "is saved beside it first).",
                    db_path.string()));
  // The restore is a command like any other: without the lab's key it cannot be signed, so nothing is touched.
  const auto key_file = store::key_path_for(db_path);
  const std::string key = store::LabKey::load(key_file).public_hex();
  std::optional<store::Actor> actor;
  if (exists) {
    store::Database current(db_path, store::Database::Open::existing);
    actor = who(current);
  }
  RestoreOutcome out;
  out.source = check_copy(file);
  if (!out.source.ok) return out;
  const std::string backup_sha256 = store::sha256_of_file(file, "restore FILE");
  try {
    SQLite::Database source(file.string(), SQLite::OPEN_READONLY);
    out.backup_lab = store::lab_identity(source);
    out.backup_checkpoint = store::latest_checkpoint(source);
    if (exists) {
      SQLite::Database current(db_path.string(), SQLite::OPEN_READWRITE);
      current.setBusyTimeout(30000);
      out.replaced_lab = store::lab_identity(current);
      require_same_lab(r, out.replaced_lab, out.backup_lab);
      require_backup_key(r, out.backup_checkpoint, key, key_file);
      out.replaced_existing = true;
      if (current.tableExists("audit_log")) out.difference = store::compare_trails(current, source);
      out.previous_records = out.difference.first_records;
      out.previous_saved =
          store::create_unique_private_file(db_path.string() + ".before-restore-" + stamp_for_file_name());
      {
        SQLite::Database saved(out.previous_saved.string(), SQLite::OPEN_READWRITE);
        copy_pages(current, saved);
        saved.exec("PRAGMA journal_mode = DELETE");
      }
      copy_pages(source, current);
    } else {
      require_backup_key(r, out.backup_checkpoint, key, key_file);
      out.difference.second_records = source.execAndGet("SELECT count(*) FROM audit_log").getInt64();
      out.difference.second_last_hash = out.source.audit.last_hash;
      if (db_path.has_parent_path()) std::filesystem::create_directories(db_path.parent_path());
      if (!store::create_private_file(db_path))
        throw InputError(fmt::format("database \"{}\" appeared while restoring; nothing restored.", db_path.string()));
      SQLite::Database target(db_path.string(), SQLite::OPEN_READWRITE);
      copy_pages(source, target);
    }
  } catch (const SQLite::Exception& e) {
    throw StorageError(
        fmt::format("restore of \"{}\" from \"{}\" failed: {}", db_path.string(), file.string(), e.what()));
  }
  // Opening through plumb applies any newer migrations to an older backup; the restore is recorded in the restored
  // trail, and then the result is proved again.
  store::Database restored(db_path, store::Database::Open::existing);
  if (!actor) {
    try {
      actor = who(restored);
    } catch (...) {
      for (const char* suffix : {"", "-wal", "-shm"}) std::filesystem::remove(db_path.string() + suffix);
      throw;
    }
  }
  // The account that restores may be newer than the backup: then the record names it without an id the restored
  // accounts do not have.
  if (actor->user_id && !store::find_user(restored.sql(), *actor->user_id)) {
    actor->name += " (an account of the replaced database)";
    actor->user_id.reset();
  }
  record_restore(restored, *actor, r, out, backup_sha256);
  out.after = store::verify_audit_trail(restored.sql());
  out.restored = true;
  return out;
}

}  // namespace plumb::app
