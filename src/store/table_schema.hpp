#pragma once
// What plumb knows about a table's columns: their names, declared types, literal defaults and the primary
// key. The Recorder uses it to record a row exactly as SQLite stores it without reading the row back, and
// `audit verify` uses it to compare stored rows with the trail.
#include <SQLiteCpp/Database.h>

#include <nlohmann/json.hpp>
#include <string>
#include <string_view>
#include <vector>

namespace plumb::store {

struct ColumnSchema {
  std::string name;
  std::string type;              ///< declared type as written in the schema, e.g. "INTEGER", "TEXT"
  nlohmann::json default_value;  ///< what the column holds when an insert does not mention it (null if none)
  bool rowid_alias = false;      ///< INTEGER PRIMARY KEY: takes the new rowid when not given
};

struct TableSchema {
  std::string name;
  std::vector<ColumnSchema> columns;
  std::vector<std::string> key_columns;  ///< primary key in key order; empty: rowid only

  [[nodiscard]] const ColumnSchema* column(std::string_view name) const;
};

/// Reads the schema of `table` (PRAGMA table_info).
TableSchema read_table_schema(SQLite::Database& db, const std::string& table);

/// A row's primary key as the trail writes it: "col=value,col=value" (text unquoted).
std::string key_text(const std::vector<std::string>& key_columns, const nlohmann::json& row);

}  // namespace plumb::store
