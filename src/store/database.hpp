#pragma once
// Opening the database: WAL journal, foreign keys, a busy timeout, and the numbered migrations of
// schema/ applied in order (PRAGMA user_version records how far).
#include <SQLiteCpp/Database.h>

#include <filesystem>
#include <memory>

namespace plumb::store {

/// Makes `ORDER BY id COLLATE natural_id` sort as every list of plumb does (core/natural_order.hpp). Database does it
/// on open; a connection opened by hand (a backup being verified) calls it before such a query.
void register_natural_collation(SQLite::Database& db);

class Database {
public:
  enum class Open { create, existing };
  /// Opens `path`. With Open::existing a missing file is an InputError (nothing is created).
  Database(const std::filesystem::path& path, Open mode);

  SQLite::Database& sql() { return *db_; }
  [[nodiscard]] int schema_version() const;
  [[nodiscard]] const std::filesystem::path& path() const { return path_; }

private:
  void migrate();
  std::filesystem::path path_;
  std::unique_ptr<SQLite::Database> db_;
};

/// The default database: $PLUMB_DB, else $XDG_DATA_HOME/plumb/plumb.db, else ~/.local/share/plumb/plumb.db.
std::filesystem::path default_database_path();

}  // namespace plumb::store
