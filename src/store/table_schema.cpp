#include "store/table_schema.hpp"

#include <SQLiteCpp/Statement.h>
#include <fmt/format.h>

#include <algorithm>

namespace plumb::store {
namespace {

using nlohmann::json;

/// A column default as SQLite reports it (an SQL literal) turned into a value. plumb's schema uses only
/// literal defaults ('' and numbers); anything else is kept as its SQL text.
json default_of(const SQLite::Column& c) {
  if (c.isNull()) return json();
  const std::string lit = c.getString();
  if (lit == "NULL") return json();
  if (lit.size() >= 2 && lit.front() == '\'' && lit.back() == '\'') {
    std::string s;
    for (std::size_t i = 1; i + 1 < lit.size(); ++i) {
      s += lit[i];
      if (lit[i] == '\'' && lit[i + 1] == '\'') ++i;
    }
    return s;
  }
  try {
    std::size_t used = 0;
    const long long n = std::stoll(lit, &used);
    if (used == lit.size()) return n;
  } catch (const std::exception&) {
  }
  return lit;
}

}  // namespace

const ColumnSchema* TableSchema::column(std::string_view wanted) const {
  const auto it = std::find_if(columns.begin(), columns.end(), [&](const ColumnSchema& c) { return c.name == wanted; });
  return it == columns.end() ? nullptr : &*it;
}

TableSchema read_table_schema(SQLite::Database& db, const std::string& table) {
  TableSchema schema;
  schema.name = table;
  SQLite::Statement q(db, fmt::format("PRAGMA table_info(\"{}\")", table));
  std::vector<std::pair<int, std::string>> pk;
  std::vector<std::string> pk_types;
  while (q.executeStep()) {
    ColumnSchema c;
    c.name = q.getColumn(1).getString();
    c.type = q.getColumn(2).getString();
    c.default_value = default_of(q.getColumn(4));
    if (const int n = q.getColumn(5).getInt(); n > 0) pk.emplace_back(n, c.name);
    schema.columns.push_back(std::move(c));
  }
  std::sort(pk.begin(), pk.end());
  for (const auto& [_, name] : pk) schema.key_columns.push_back(name);
  if (schema.key_columns.size() == 1)
    for (auto& c : schema.columns)
      if (c.name == schema.key_columns[0]) c.rowid_alias = c.type == "INTEGER";
  return schema;
}

std::string key_text(const std::vector<std::string>& key_columns, const nlohmann::json& row) {
  std::string key;
  for (const auto& k : key_columns) {
    if (!key.empty()) key += ',';
    key += k;
    key += '=';
    if (!row.contains(k)) key += '?';
    else if (const auto& v = row[k]; v.is_string()) key += v.get_ref<const std::string&>();
    else key += v.dump();
  }
  return key;
}

}  // namespace plumb::store
