#include "support/insider.hpp"

#include "support/audit_chain.hpp"

#include <SQLiteCpp/Database.h>
#include <SQLiteCpp/Statement.h>
#include <SQLiteCpp/Transaction.h>
#include <openssl/evp.h>

#include <nlohmann/json.hpp>
#include <stdexcept>
#include <vector>

namespace plumb::test {

std::string documented_audit_hash(const std::string& prev_hash, const std::string& canonical_json) {
  const std::string text = prev_hash + "\n" + canonical_json;
  unsigned char digest[EVP_MAX_MD_SIZE];
  unsigned int size = 0;
  if (EVP_Digest(text.data(), text.size(), digest, &size, EVP_sha256(), nullptr) != 1)
    throw std::runtime_error("SHA-256 failed");
  static constexpr char hex[] = "0123456789abcdef";
  std::string out;
  for (unsigned i = 0; i < size; ++i) {
    out += hex[digest[i] >> 4];
    out += hex[digest[i] & 0x0f];
  }
  return out;
}

void edit_recorded_field(SQLite::Database& db, const std::string& table, const std::string& key_column, long long key,
                         const std::string& column, const nlohmann::json& value) {
  SQLite::Statement update(db, "UPDATE \"" + table + "\" SET \"" + column + "\" = ? WHERE \"" + key_column + "\" = ?");
  if (value.is_null())
    update.bind(1);
  else if (value.is_number_integer())
    update.bind(1, value.get<std::int64_t>());
  else
    update.bind(1, value.get<std::string>());
  update.bind(2, static_cast<std::int64_t>(key));
  if (update.exec() != 1) throw std::runtime_error("no row " + table + " " + key_column + "=" + std::to_string(key));

  SQLite::Statement q(db, "SELECT seq, action, after_json FROM audit_log WHERE after_json LIKE ? ORDER BY seq");
  q.bind(1, "%\"" + table + "\"%");
  while (q.executeStep()) {
    nlohmann::json after = nlohmann::json::parse(q.getColumn(2).getString());
    const std::string action = q.getColumn(1).getString();
    bool changed = false;
    if (action == "insert" && after.value(key_column, nlohmann::json()) == key && after.contains(column)) {
      after[column] = value;
      changed = true;
    } else if (action == "insert rows" && after.contains(table)) {
      auto& block = after[table];
      const auto& columns = block["columns"];
      const auto at = [&](const std::string& name) {
        for (std::size_t i = 0; i < columns.size(); ++i)
          if (columns[i] == name) return i;
        throw std::runtime_error("no column " + name);
      };
      for (auto& row : block["rows"])
        if (row[at(key_column)] == key) {
          row[at(column)] = value;
          changed = true;
        }
    }
    if (!changed) continue;
    SQLite::Statement write(db, "UPDATE audit_log SET after_json = ? WHERE seq = ?");
    write.bind(1, after.dump());
    write.bind(2, q.getColumn(0).getInt64());
    write.exec();
    return;
  }
  throw std::runtime_error("no audit record of " + table + " " + key_column + "=" + std::to_string(key));
}

void insider_rewrite(const std::filesystem::path& db, const std::function<void(SQLite::Database&)>& edit) {
  SQLite::Database d(db.string(), SQLite::OPEN_READWRITE);
  d.setBusyTimeout(30000);
  SQLite::Transaction tx(d, SQLite::TransactionBehavior::IMMEDIATE);
  std::vector<std::pair<std::string, std::string>> triggers;
  {
    SQLite::Statement q(d, "SELECT name, sql FROM sqlite_schema WHERE type = 'trigger'");
    while (q.executeStep()) triggers.emplace_back(q.getColumn(0).getString(), q.getColumn(1).getString());
  }
  for (const auto& [name, _] : triggers) d.exec("DROP TRIGGER \"" + name + "\"");
  edit(d);

  struct Row {
    long long seq;
    nlohmann::json record;
  };
  std::vector<Row> rows;
  {
    SQLite::Statement q(d,
                        "SELECT seq, at, os_user, actor, action, table_name, row_key, before_json, after_json, "
                        "reason, user_id FROM audit_log ORDER BY seq");
    while (q.executeStep()) rows.push_back({q.getColumn(0).getInt64(), hashed_audit_record(q, 10)});
  }
  std::string prev(64, '0');
  SQLite::Statement update(d, "UPDATE audit_log SET prev_hash = ?, hash = ? WHERE seq = ?");
  for (const auto& r : rows) {
    const std::string hash = documented_audit_hash(prev, r.record.dump());
    update.bind(1, prev);
    update.bind(2, hash);
    update.bind(3, static_cast<std::int64_t>(r.seq));
    update.exec();
    update.reset();
    prev = hash;
  }
  for (const auto& [_, text] : triggers) d.exec(text);
  tx.commit();
}

}  // namespace plumb::test
