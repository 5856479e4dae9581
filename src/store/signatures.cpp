#include "store/signatures.hpp"

#include <SQLiteCpp/Statement.h>
#include <fmt/format.h>

#include "core/errors.hpp"

namespace plumb::store {
namespace {

constexpr const char* signature_select =
    "SELECT id, user_id, printed_name, signed_at, meaning, table_name, row_key, signed_sha256 FROM signatures";

std::vector<SignatureRecord> signatures_from(SQLite::Statement& q) {
  std::vector<SignatureRecord> out;
  while (q.executeStep())
    out.push_back({q.getColumn(0).getInt64(), q.getColumn(1).getInt64(), q.getColumn(2).getString(),
                   q.getColumn(3).getString(), q.getColumn(4).getString(), q.getColumn(5).getString(),
                   q.getColumn(6).getString(), q.getColumn(7).getString()});
  return out;
}

}  // namespace

std::optional<std::string> signed_content(SQLite::Database& db, const std::string& table, const std::string& row_key) {
  SQLite::Statement q(
      db,
      "SELECT after_json FROM audit_log WHERE table_name = ? AND row_key = ? AND after_json IS NOT NULL "
      "ORDER BY seq LIMIT 1");
  q.bind(1, table);
  q.bind(2, row_key);
  if (!q.executeStep()) return std::nullopt;
  return q.getColumn(0).getString();
}

SignatureRecord add_signature(Recorder& rec, SQLite::Database& db, const std::string& table, const std::string& row_key,
                              const std::string& meaning) {
  if (!rec.actor().user_id) throw StorageError("a signature needs an authenticated user.");
  const auto content = signed_content(db, table, row_key);
  if (!content)
    throw StorageError(fmt::format("{} {} is not in the audit trail; it cannot be signed.", table, row_key));
  SignatureRecord s;
  s.user_id = *rec.actor().user_id;
  s.printed_name = rec.actor().name;
  s.signed_at = rec.now();
  s.meaning = meaning;
  s.table_name = table;
  s.row_key = row_key;
  s.signed_sha256 = sha256_hex(*content);
  s.id = rec.insert("signatures",
                    {{"user_id", s.user_id},
                     {"printed_name", s.printed_name},
                     {"signed_at", s.signed_at},
                     {"meaning", s.meaning},
                     {"table_name", s.table_name},
                     {"row_key", s.row_key},
                     {"signed_sha256", s.signed_sha256}},
                    {"id"});
  return s;
}

std::vector<SignatureRecord> signatures_of(SQLite::Database& db, const std::string& table, const std::string& row_key) {
  SQLite::Statement q(db, std::string(signature_select) + " WHERE table_name = ? AND row_key = ? ORDER BY id");
  q.bind(1, table);
  q.bind(2, row_key);
  return signatures_from(q);
}

std::vector<SignatureRecord> all_signatures(SQLite::Database& db) {
  SQLite::Statement q(db, std::string(signature_select) + " ORDER BY id");
  return signatures_from(q);
}

}  // namespace plumb::store
