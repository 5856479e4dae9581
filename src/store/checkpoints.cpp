#include "store/checkpoints.hpp"

#include <SQLiteCpp/Statement.h>
#include <fmt/format.h>

#include <fstream>
#include <sstream>

#include "core/errors.hpp"
#include "store/audit_trail.hpp"
#include "store/recorder.hpp"

namespace plumb::store {

using nlohmann::json;

std::string checkpoint_statement(const Checkpoint& c) {
  // Plain lines rather than JSON: an inspector can rebuild it by hand and check it with `openssl pkeyutl`.
  return fmt::format("plumb audit checkpoint\nnumber: {}\nrecords: {}\nhead: {}\nsigned at: {}\ncovers: {}\n", c.number,
                     c.records, c.head_hash, c.signed_at, c.covers);
}

Checkpoint checkpoint_from_row(SQLite::Statement& q) {
  Checkpoint c;
  c.number = q.getColumn(0).getInt64();
  c.records = q.getColumn(1).getInt64();
  c.head_hash = q.getColumn(2).getString();
  c.signed_at = q.getColumn(3).getString();
  c.covers = q.getColumn(4).getString();
  c.public_key = q.getColumn(5).getString();
  c.signature = q.getColumn(6).getString();
  return c;
}

std::optional<Checkpoint> latest_checkpoint(SQLite::Database& db) {
  if (!db.tableExists("checkpoints")) return std::nullopt;
  SQLite::Statement q(db, fmt::format("SELECT {} FROM checkpoints ORDER BY number DESC LIMIT 1", checkpoint_columns));
  if (!q.executeStep()) return std::nullopt;
  return checkpoint_from_row(q);
}

std::optional<Checkpoint> checkpoint_covering(SQLite::Database& db, std::int64_t seq) {
  if (!db.tableExists("checkpoints")) return std::nullopt;
  SQLite::Statement q(
      db, fmt::format("SELECT {} FROM checkpoints WHERE records >= ? ORDER BY number LIMIT 1", checkpoint_columns));
  q.bind(1, seq);
  if (!q.executeStep()) return std::nullopt;
  return checkpoint_from_row(q);
}

std::optional<Checkpoint> checkpoint_covering_row(SQLite::Database& db, const std::string& table,
                                                  const std::string& row_key) {
  SQLite::Statement q(db, "SELECT seq FROM audit_log WHERE table_name = ? AND row_key = ? ORDER BY seq LIMIT 1");
  q.bind(1, table);
  q.bind(2, row_key);
  if (!q.executeStep()) return std::nullopt;
  return checkpoint_covering(db, q.getColumn(0).getInt64());
}

std::optional<Checkpoint> write_checkpoint(SQLite::Database& db, const LabKey& key, std::int64_t first_of_command) {
  SQLite::Statement tail(db, "SELECT seq, hash FROM audit_log ORDER BY seq DESC LIMIT 1");
  Checkpoint c;
  c.head_hash = genesis_hash();
  if (tail.executeStep()) {
    c.records = tail.getColumn(0).getInt64();
    c.head_hash = tail.getColumn(1).getString();
  }
  const auto last = latest_checkpoint(db);
  if (last && last->records == c.records) return std::nullopt;
  c.number = last ? last->number + 1 : 1;
  c.signed_at = utc_timestamp();
  const std::int64_t before = first_of_command == 0 ? c.records : first_of_command - 1;
  c.covers = !last && before > 0 ? "records before checkpoints" : "command";
  c.public_key = key.public_hex();
  c.signature = key.sign(checkpoint_statement(c));
  SQLite::Statement insert(
      db, fmt::format("INSERT INTO checkpoints ({}) VALUES (?, ?, ?, ?, ?, ?, ?)", checkpoint_columns));
  insert.bind(1, c.number);
  insert.bind(2, c.records);
  insert.bind(3, c.head_hash);
  insert.bind(4, c.signed_at);
  insert.bind(5, c.covers);
  insert.bind(6, c.public_key);
  insert.bind(7, c.signature);
  insert.exec();
  return c;
}

json checkpoint_json(const Checkpoint& c) {
  return {{"plumb_checkpoint", 1},    {"number", c.number}, {"records", c.records},       {"head_hash", c.head_hash},
          {"signed_at", c.signed_at}, {"covers", c.covers}, {"public_key", c.public_key}, {"signature", c.signature}};
}

Checkpoint read_checkpoint_file(const std::filesystem::path& file, const std::string& option) {
  std::ifstream in(file, std::ios::binary);
  if (!in) throw InputError(fmt::format("{} \"{}\" cannot be read.", option, file.string()));
  std::ostringstream text;
  text << in.rdbuf();
  const json j = json::parse(text.str(), nullptr, false);
  if (!j.is_object() || !j.contains("plumb_checkpoint"))
    throw InputError(fmt::format("{} \"{}\" is not a checkpoint exported by `plumb audit checkpoint export`.", option,
                                 file.string()));
  const auto integer = [&](const char* field) {
    if (!j.contains(field) || !j[field].is_number_integer() || j[field].get<std::int64_t>() < 0)
      throw InputError(fmt::format("{} \"{}\": field {} must be a whole number.", option, file.string(), field));
    return j[field].get<std::int64_t>();
  };
  const auto text_field = [&](const char* field) {
    if (!j.contains(field) || !j[field].is_string())
      throw InputError(fmt::format("{} \"{}\": field {} must be a text.", option, file.string(), field));
    return j[field].get<std::string>();
  };
  Checkpoint c;
  c.number = integer("number");
  c.records = integer("records");
  c.head_hash = text_field("head_hash");
  c.signed_at = text_field("signed_at");
  c.covers = text_field("covers");
  c.public_key = text_field("public_key");
  c.signature = text_field("signature");
  return c;
}

}  // namespace plumb::store
