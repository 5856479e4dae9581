#include "store/schema_verification.hpp"

#include <SQLiteCpp/Statement.h>
#include <fmt/format.h>

#include <map>
#include <string>

#include "store/database.hpp"
#include "store/embedded.hpp"

namespace plumb::store {
namespace {

struct SchemaObject {
  std::string type, table, sql;
};

std::map<std::string, SchemaObject> schema_objects(SQLite::Database& db) {
  // SQLite's own objects (sqlite_sequence, sqlite_stat1, automatic indexes) are not plumb's to compare.
  SQLite::Statement q(db,
                      "SELECT type, name, tbl_name, coalesce(sql, '') FROM sqlite_schema "
                      "WHERE name NOT LIKE 'sqlite_%'");
  std::map<std::string, SchemaObject> out;
  while (q.executeStep())
    out[q.getColumn(1).getString()] = {q.getColumn(0).getString(), q.getColumn(2).getString(),
                                       q.getColumn(3).getString()};
  return out;
}

struct ColumnInfo {
  std::string type, default_value;
  int not_null = 0, key = 0;
  friend bool operator==(const ColumnInfo&, const ColumnInfo&) = default;
};

std::map<std::string, ColumnInfo> column_infos(SQLite::Database& db, const std::string& table) {
  SQLite::Statement q(db, "SELECT name, type, \"notnull\", coalesce(dflt_value, ''), pk FROM pragma_table_info(?)");
  q.bind(1, table);
  std::map<std::string, ColumnInfo> out;
  while (q.executeStep())
    out[q.getColumn(0).getString()] = {q.getColumn(1).getString(), q.getColumn(3).getString(), q.getColumn(2).getInt(),
                                       q.getColumn(4).getInt()};
  return out;
}

int leading_number(std::string_view name) {
  int n = 0;
  for (char c : name) {
    if (c < '0' || c > '9') break;
    n = n * 10 + (c - '0');
  }
  return n;
}

AuditProblem schema_problem(const std::string& table, std::string message) {
  AuditProblem p;
  p.kind = AuditProblem::Kind::schema;
  p.table = table;
  p.message = std::move(message);
  return p;
}

std::string object_text(const std::string& type, const std::string& name, const std::string& table) {
  return type == "table" ? fmt::format("table {}", name) : fmt::format("{} {} (on table {})", type, name, table);
}

void compare_columns(SQLite::Database& expected_db, SQLite::Database& db, const std::string& table,
                     std::vector<AuditProblem>& out) {
  const auto expected = column_infos(expected_db, table);
  const auto actual = column_infos(db, table);
  bool named = false;
  for (const auto& [name, info] : actual) {
    const auto e = expected.find(name);
    if (e == expected.end()) {
      out.push_back(schema_problem(table, fmt::format("column {}.{} ({}) is not created by plumb's migrations: it was "
                                                      "added outside plumb.",
                                                      table, name, info.type.empty() ? "no type" : info.type)));
      named = true;
    } else if (!(e->second == info)) {
      out.push_back(schema_problem(
          table, fmt::format("column {}.{} is declared differently from what plumb's migrations create ({} instead "
                             "of {}): it was changed outside plumb.",
                             table, name, info.type, e->second.type)));
      named = true;
    }
  }
  for (const auto& [name, info] : expected)
    if (!actual.count(name)) {
      out.push_back(
          schema_problem(table, fmt::format("column {}.{} is missing: it was dropped outside plumb.", table, name)));
      named = true;
    }
  if (!named)
    out.push_back(schema_problem(table, fmt::format("table {} is defined differently from what plumb's migrations "
                                                    "create (its constraints were changed outside plumb).",
                                                    table)));
}

}  // namespace

std::vector<AuditProblem> verify_schema(SQLite::Database& db, std::int64_t& objects) {
  const int version = db.execAndGet("PRAGMA user_version").getInt();
  SQLite::Database expected_db(":memory:", SQLite::OPEN_READWRITE | SQLite::OPEN_CREATE);
  register_natural_collation(expected_db);
  for (const auto& m : embedded::migrations())
    if (leading_number(m.name) <= version) expected_db.exec(std::string(m.sql));

  const auto expected = schema_objects(expected_db);
  const auto actual = schema_objects(db);
  objects = static_cast<std::int64_t>(actual.size());
  std::vector<AuditProblem> out;
  for (const auto& [name, e] : expected) {
    const auto a = actual.find(name);
    if (a == actual.end()) {
      out.push_back(schema_problem(
          e.table, fmt::format("{} is missing: it was dropped outside plumb.", object_text(e.type, name, e.table))));
    } else if (a->second.type != e.type || a->second.table != e.table) {
      out.push_back(schema_problem(
          e.table, fmt::format("{} is now {}: it was replaced outside plumb.", object_text(e.type, name, e.table),
                               object_text(a->second.type, name, a->second.table))));
    } else if (a->second.sql != e.sql) {
      if (e.type == "table")
        compare_columns(expected_db, db, name, out);
      else
        out.push_back(schema_problem(e.table, fmt::format("{} differs from what plumb's migrations create: it was "
                                                          "replaced outside plumb.",
                                                          object_text(e.type, name, e.table))));
    }
  }
  for (const auto& [name, a] : actual)
    if (!expected.count(name))
      out.push_back(schema_problem(a.table, fmt::format("{} is not created by plumb's migrations: it was added outside "
                                                        "plumb.",
                                                        object_text(a.type, name, a.table))));
  return out;
}

}  // namespace plumb::store
