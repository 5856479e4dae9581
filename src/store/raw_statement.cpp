#include "store/raw_statement.hpp"

#include <fmt/format.h>

#include "core/errors.hpp"

namespace plumb::store {

RawStatement::RawStatement(SQLite::Database& db, const std::string& sql) : db_(db.getHandle()) {
  if (sqlite3_prepare_v2(db_, sql.c_str(), static_cast<int>(sql.size()), &stmt_, nullptr) != SQLITE_OK) {
    const std::string message = sqlite3_errmsg(db_);
    sqlite3_finalize(stmt_);
    throw StorageError(fmt::format("the database cannot be read ({}).", message));
  }
}

RawStatement::~RawStatement() {
  sqlite3_finalize(stmt_);
}

bool RawStatement::step() {
  const int rc = sqlite3_step(stmt_);
  if (rc == SQLITE_ROW) return true;
  if (rc == SQLITE_DONE) return false;
  throw StorageError(fmt::format("the database cannot be read ({}).", sqlite3_errmsg(db_)));
}

void RawStatement::reset() {
  sqlite3_reset(stmt_);
  sqlite3_clear_bindings(stmt_);
}

std::string_view column_text(sqlite3_stmt* q, int i) {
  const auto* p = reinterpret_cast<const char*>(sqlite3_column_text(q, i));
  return p ? std::string_view(p, static_cast<std::size_t>(sqlite3_column_bytes(q, i))) : std::string_view();
}

}  // namespace plumb::store
