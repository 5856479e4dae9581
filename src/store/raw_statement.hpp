#pragma once
// A prepared statement read through SQLite's C interface directly: `audit verify` reads every column of every
// row of a lab's database, and views of the values (no copy, no wrapper object per column) keep that close to
// the cost of reading the pages.
#include <SQLiteCpp/Database.h>
#include <sqlite3.h>

#include <cstdint>
#include <string>
#include <string_view>

namespace plumb::store {

class RawStatement {
 public:
  /// StorageError naming SQLite's message when `sql` does not prepare.
  RawStatement(SQLite::Database& db, const std::string& sql);
  ~RawStatement();
  RawStatement(const RawStatement&) = delete;
  RawStatement& operator=(const RawStatement&) = delete;

  /// The next row: true when there is one (StorageError on a read error).
  bool step();
  /// Back to before the first row, bindings cleared.
  void reset();
  [[nodiscard]] sqlite3_stmt* get() const { return stmt_; }

 private:
  sqlite3* db_;
  sqlite3_stmt* stmt_ = nullptr;
};

/// Column `i` of the current row as text without a copy (empty for NULL); valid until the next step.
std::string_view column_text(sqlite3_stmt* q, int i);

}  // namespace plumb::store
