#pragma once
// The one place where plumb writes records. Every insert is mirrored in the audit trail with who,
// when, what and why, chained by SHA-256 so that a record changed behind plumb's back is detectable.
#include <SQLiteCpp/Database.h>
#include <SQLiteCpp/Statement.h>
#include <SQLiteCpp/Transaction.h>

#include <functional>
#include <map>
#include <memory>
#include <nlohmann/json.hpp>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "store/lab_key.hpp"
#include "store/row.hpp"
#include "store/table_schema.hpp"

namespace plumb::store {

struct Actor {
  std::string name;     ///< the printed name of the authenticated user (app/people/authenticate.hpp)
  std::string os_user;  ///< the operating-system account running plumb
  /// The user account (table users) that wrote; every record since user accounts has one.
  std::optional<std::int64_t> user_id{};
};

/// The OS account name of this process.
std::string current_os_user();
/// Current UTC time, ISO 8601 with seconds and a Z.
std::string utc_timestamp();

class RowGroup;

/// Rows and their audit record, computed but not yet written (Recorder::prepare_together). A batch import
/// prepares them on one thread while the database thread writes the ones before.
struct PreparedGroup {
  struct Insert {
    std::string table;
    std::vector<Row> rows;  ///< every key given
  };
  std::vector<Insert> inserts;  ///< in the order they were made
  std::int64_t seq = 0;         ///< the audit record's place in the chain
  std::string action, table, key, after_json, reason, prev_hash, hash;
};

class Recorder {
public:
 /// Reads the lab's signing key of the database file (store::key_path_for) first: a command that cannot sign
 /// its records is refused before it writes anything (InputError naming the key file). An in-memory database
 /// has no key; its records cannot be committed with commit().
 Recorder(SQLite::Database& db, Actor actor);

 /// Ends the command: signs a checkpoint covering every record written (store/checkpoints), then commits `tx`.
 /// Every command that writes records ends this way, so that the trail's end is always signed.
 void commit(SQLite::Transaction& tx);

 /// Inserts `row` into `table` and appends the audit record. `key_columns` name the primary key; a
 /// single integer key absent from `row` is taken from the new rowid. Returns the rowid.
 std::int64_t insert(const std::string& table, const Row& row, const std::vector<std::string>& key_columns,
                     const std::string& reason = "");

 /// Inserts rows that make one record together (a check run with its weights and readings) under one
 /// audit record (action "insert rows"): the trail then reads one entry per thing a person recorded, and
 /// a batch import does not write a trail record for every reading. `fill` inserts the rows.
 void insert_together(const std::string& reason, const std::function<void(RowGroup&)>& fill);
 /// insert_together in two steps: compute the rows (with their ids) and the audit record ...
 PreparedGroup prepare_together(const std::string& reason, const std::function<void(RowGroup&)>& fill);
 /// ... and write them. Groups are written in the order they were prepared.
 void write(const PreparedGroup& group);
 /// Several prepared groups at once, in order: each table's rows of all of them with multi-row INSERTs, then
 /// their audit records (a batch import writes a chunk of runs this way).
 void write(std::span<const PreparedGroup> groups);

 /// Batch mode, for a batch import inside one write transaction: the chain's tail and the next id of each
 /// of `tables` are read once and then kept in memory (the transaction holds the write lock, so nobody
 /// else can append), which lets prepare_together run on another thread without touching the database
 /// while this one writes. Only prepare_together and write may be used until end_batch.
 void begin_batch(const std::vector<std::string>& tables);
 void end_batch();

 [[nodiscard]] const Actor& actor() const { return actor_; }
 [[nodiscard]] const std::string& now() const { return now_; }

private:
  friend class RowGroup;
  /// An INSERT of `rows` rows prepared for one table and one list of columns, with what each column must hold.
  struct Writer {
    std::string table;
    std::size_t rows = 1;
    std::vector<std::string> columns;
    std::vector<Value::Kind> kinds;  ///< per column of `columns`: integer or text (NULL is always allowed)
    std::unique_ptr<SQLite::Statement> insert;
  };

  // Computing (no database access in batch mode).
  const TableSchema& schema(const std::string& table);
  std::int64_t next_rowid(const std::string& table);
  std::pair<std::int64_t, std::string> chain_tail();
  /// Appends `row` as the trail records it: a JSON object of every column (unmentioned columns with their
  /// literal defaults, the rowid of an integer key), built from the values given, not read back.
  void append_recorded(const TableSchema& schema, const Row& row, std::int64_t rowid, std::string& recorded);
  [[nodiscard]] std::string audit_hash_of(const PreparedGroup& g) const;
  /// Places the record after the chain's tail: its seq, previous hash and hash.
  void chain(PreparedGroup& g);

  // Writing (the database thread).
  Writer& writer(const std::string& table, const Row& row, std::size_t rows);
  void bind_row(Writer& w, const Row& row, std::size_t first_parameter);
  /// Inserts rows, consecutive rows with the same columns several to a statement.
  void write_rows(const std::string& table, std::span<const Row* const> rows);
  /// Appends the groups' audit records, several to a statement.
  void write_audits(std::span<const PreparedGroup> groups);
  /// A prepared statement for `sql`, reset for reuse.
  SQLite::Statement& statement(const std::string& sql);

  SQLite::Database& db_;
  Actor actor_;
  std::optional<LabKey> key_;
  std::int64_t first_seq_ = 0;  ///< the first audit record this Recorder wrote (0: none yet)
  std::string now_;  ///< one timestamp for the whole command
  std::map<std::string, std::unique_ptr<SQLite::Statement>> statements_;
  std::map<std::string, TableSchema> schemas_;
  /// A batch import inserts millions of rows with a handful of distinct statements; preparing each one
  /// anew would cost more than the insert.
  std::vector<std::unique_ptr<Writer>> writers_;
  std::map<std::size_t, std::unique_ptr<SQLite::Statement>> audit_inserts_;  ///< by the number of records
  bool batch_ = false;
  std::int64_t tail_seq_ = 0;  ///< batch mode: the chain's last record
  std::string tail_hash_;
  std::map<std::string, std::int64_t> next_rowid_;  ///< batch mode: per table; otherwise within one group
};

/// The rows of one Recorder::insert_together call.
class RowGroup {
public:
  /// As Recorder::insert, without an audit record of its own: the group's record covers the row. An integer
  /// key that is not given is assigned here (the next rowid), so the id is known before anything is written.
  std::int64_t insert(const std::string& table, Row row, const std::vector<std::string>& key_columns);
  /// Several rows of one table with the same columns and every key column given (readings): written
  /// several to a statement, which is what makes a batch import of millions of readings affordable.
  void insert_rows(const std::string& table, std::vector<Row> rows);

private:
  friend class Recorder;
  explicit RowGroup(Recorder& rec) : rec_(rec) { blocks_.reserve(4); }
  /// A table's rows as the trail records them: the column names once, then each row's values.
  struct Block {
    std::string table;
    const TableSchema* schema = nullptr;
    std::vector<std::string> given;  ///< the columns each row gives, in order
    std::vector<const ColumnSchema*> left;  ///< schema columns the rows leave to SQLite (default or rowid)
    std::string rows;  ///< "[..],[..]"
  };
  void record(const std::string& table, const Row& row, std::int64_t rowid);
  Recorder& rec_;
  PreparedGroup group_;
  std::vector<Block> blocks_;
};

/// SHA-256 of `text` as lowercase hex (OpenSSL libcrypto).
std::string sha256_hex(std::string_view text);

/// The current row of `row` as a JSON object, column -> integer, text, real or null (a blob becomes
/// "blob:" and its SHA-256).
nlohmann::json row_json(SQLite::Statement& row);

/// Texts longer than this are recorded in the trail by their SHA-256 instead of a copy (stored results,
/// certificate content): the table holds the text, the digest proves it unchanged, and the trail does not
/// double the size of the database.
constexpr std::size_t long_text_bytes = 256;
/// Whether a stored value is what the trail recorded (a copy, or the SHA-256 of a long text).
bool matches_recorded(const nlohmann::json& recorded, const nlohmann::json& stored);

/// The hash of an audit record: SHA-256 over the previous hash and the canonical JSON of the record.
std::string audit_hash(const std::string& prev_hash, const nlohmann::json& record);

/// The fields of an audit record that its hash covers.
struct AuditContent {
  std::int64_t seq = 0;
  std::string_view at, os_user, actor, action, table_name, row_key;
  const std::string* before_json = nullptr;  ///< null: none
  const std::string* after_json = nullptr;   ///< null: none
  const std::string* reason = nullptr;       ///< null: none
  std::optional<std::int64_t> user_id;       ///< absent (and not hashed) on records from before user accounts
};
/// The canonical JSON of a record's content, byte for byte what nlohmann::json::dump() writes for the same
/// object (keys sorted), so that audit_hash(prev, that object) == SHA-256 of prev + "\n" + this text.
std::string canonical_audit_json(const AuditContent& c);
/// The same, appended to `out`.
void append_canonical_audit_json(std::string& out, const AuditContent& c);

}  // namespace plumb::store
