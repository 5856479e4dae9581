#include "store/database.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>
#include <sqlite3.h>

#include <sys/stat.h>

#include <cerrno>
#include <cstdlib>
#include <cstring>
#include <string>
#include <vector>

#include "core/errors.hpp"
#include "core/natural_order.hpp"
#include "store/embedded.hpp"
#include "store/file_access.hpp"
#include "store/private_file.hpp"

namespace plumb::store {
namespace {

int migration_number(std::string_view name) {
  int n = 0;
  for (char c : name) {
    if (c < '0' || c > '9') break;
    n = n * 10 + (c - '0');
  }
  return n;
}

int natural_collation(void*, int a_size, const void* a, int b_size, const void* b) {
  return compare_natural(std::string_view(static_cast<const char*>(a), static_cast<std::size_t>(a_size)),
                         std::string_view(static_cast<const char*>(b), static_cast<std::size_t>(b_size)));
}

/// The folders plumb makes for a new database are mode 0700 and the file 0600 (SQLite gives its -wal and -shm
/// files the mode of the database): the lab's records are readable by their owner only, or with a lab group
/// (store/file_access.hpp) 02770 and 0660, the group's.
void create_private_database_file(const std::filesystem::path& path) {
  std::vector<std::filesystem::path> missing;
  for (auto p = path.parent_path(); !p.empty() && !std::filesystem::exists(p); p = p.parent_path())
    missing.push_back(p);
  for (auto it = missing.rbegin(); it != missing.rend(); ++it)
    if (::mkdir(it->c_str(), record_folder_mode()) == 0)
      give_to_lab_group(-1, it->c_str());
    else if (errno != EEXIST)
      throw StorageError(fmt::format("cannot create the folder \"{}\": {}.", it->string(), std::strerror(errno)));
  if (!std::filesystem::exists(path)) create_private_file(path);
}

}  // namespace

void register_natural_collation(SQLite::Database& db) {
  if (sqlite3_create_collation_v2(db.getHandle(), "natural_id", SQLITE_UTF8, nullptr, natural_collation, nullptr) !=
      SQLITE_OK)
    throw StorageError(fmt::format("cannot register the natural collation: {}", sqlite3_errmsg(db.getHandle())));
}

std::filesystem::path default_database_path() {
  if (const char* env = std::getenv("PLUMB_DB"); env && *env) return env;
  if (const char* xdg = std::getenv("XDG_DATA_HOME"); xdg && *xdg)
    return std::filesystem::path(xdg) / "plumb" / "plumb.db";
  const char* home = std::getenv("HOME");
  return std::filesystem::path(home ? home : ".") / ".local" / "share" / "plumb" / "plumb.db";
}

Database::Database(const std::filesystem::path& path, Open mode) : path_(path) {
  if (mode == Open::existing && !std::filesystem::exists(path))
    throw InputError(fmt::format("database \"{}\" does not exist; create it with `plumb --db {} init --lab NAME`.",
                                 path.string(), path.string()));
  if (mode == Open::create) create_private_database_file(path);
  try {
    // One connection per process, used by one thread: SQLite's per-call mutexes are not needed.
    const int flags = (mode == Open::create ? (SQLite::OPEN_READWRITE | SQLite::OPEN_CREATE) : SQLite::OPEN_READWRITE) |
                      SQLite::OPEN_NOMUTEX;
    db_ = std::make_unique<SQLite::Database>(path.string(), flags);
    // Concurrent writers wait rather than fail: "database is locked" must not reach the user.
    db_->setBusyTimeout(30000);
    db_->exec("PRAGMA foreign_keys = ON");
    register_natural_collation(*db_);
    if (mode == Open::create) {
      // 8 KiB pages for a new database (SQLite's default is 4 KiB): a check run's stored results and its
      // audit record are 1-2 KiB each, and larger pages mean fewer page splits and write-ahead-log frames
      // per run (a 1,000,000-reading import commits about 30 % faster). No effect on an existing database.
      db_->exec("PRAGMA page_size = 8192");
      db_->exec("PRAGMA journal_mode = WAL");
    }
    db_->exec("PRAGMA synchronous = NORMAL");
    migrate();
  } catch (const SQLite::Exception& e) {
    throw StorageError(fmt::format("cannot open database \"{}\": {}", path.string(), e.what()));
  }
}

int Database::schema_version() const {
  return db_->execAndGet("PRAGMA user_version").getInt();
}

void Database::migrate() {
  const int current = schema_version();
  const auto& all = embedded::migrations();
  if (!all.empty() && current > migration_number(all.back().name))
    throw StorageError(fmt::format("database \"{}\" has schema version {}, newer than this plumb understands ({}).",
                                   path_.string(), current, migration_number(all.back().name)));
  for (const auto& m : all) {
    const int n = migration_number(m.name);
    if (n <= current) continue;
    SQLite::Transaction tx(*db_, SQLite::TransactionBehavior::IMMEDIATE);
    // Re-read inside the write lock: another process may have migrated meanwhile.
    if (schema_version() >= n) continue;
    db_->exec(std::string(m.sql));
    db_->exec(fmt::format("PRAGMA user_version = {}", n));
    tx.commit();
  }
}

}  // namespace plumb::store
