// `audit verify` against a tamperer who goes around plumb: rows changed, added or removed directly with the
// sqlite3 library after dropping the append-only triggers, and audit records deleted, reordered or altered.
// Every tamper runs inside a savepoint that is rolled back, so one database serves all of them.
#include <sqlite3.h>
#include <catch2/catch.hpp>

#include <algorithm>
#include <map>
#include <random>
#include <set>

#include "app/certificates/issue.hpp"
#include "app/certificates/review.hpp"
#include "app/registry/balances.hpp"
#include "app/registry/lab.hpp"
#include "app/registry/service_status.hpp"
#include "app/registry/weights.hpp"
#include "app/runs/correct.hpp"
#include "app/weekly_check/record.hpp"
#include "store/audit_trail.hpp"
#include "support/registry_inputs.hpp"
#include "support/run_plumb.hpp"
#include "support/test_accounts.hpp"

using namespace plumb;
using Kind = store::AuditProblem::Kind;

namespace {

const std::string good_readings =
    "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0002\n";

/// A small lab with a row in every table plumb audits: lab, weights and a recalibration, balances, runs with
/// readings, certificates, an approval, a correction (superseded run and certificate), a retirement.
void build_lab(store::Database& db) {
  const store::Actor tech{"A. Technician", "tech"};
  app::init_lab(db, {"Q. Manager", "qm"}, "Example Analytical Lab");
  // Approving and correcting are signatures: the manager has an account (and so the accounts' tables have rows).
  test::TestAccounts accounts(db);
  const store::Actor manager = accounts.add("qman", "Q. Manager", {"quality manager"});
  app::WeightInput w = test::e2_weight("W100", "100g", "RC-2291", "2026-03-02", "2027-03-02");
  w.correction = "0.03mg";
  app::add_weight(db, manager, w);
  w.id = "W200";
  w.nominal = "200g";
  w.certificate = "RC-2292";
  app::add_weight(db, manager, w);
  for (const char* id : {"BAL-A", "BAL-B"}) {
    app::BalanceInput b = test::usp41_balance(id, "7d", "2026-01-05");
    b.location = "Room 2";
    app::add_balance(db, manager, b);
  }
  for (const char* on : {"2026-11-16", "2026-11-23"}) {
    app::CheckInput c;
    c.instrument_id = "BAL-A";
    c.weight_ids = {"W100"};
    c.readings_csv = good_readings;
    c.readings_source = "r.csv";
    c.on = on;
    c.operator_name = "A. Technician";
    app::record_check(db, tech, c);
  }
  app::issue_certificate(db, manager, "1", std::nullopt);
  app::issue_certificate(db, manager, "2", std::nullopt);
  app::approve_certificate(db, manager, "1", "reviewed and approved");
  app::CorrectionInput fix;
  fix.run = "2";
  fix.reason = "reading 10 was mistyped";
  fix.readings_csv =
      "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n"
      "100.0003\n100.0003\n";
  fix.readings_source = "fixed.csv";
  app::correct_check(db, manager, fix);
  app::change_service_status(db, manager, "instrument", "BAL-B", "retired", "replaced");
}

void exec(SQLite::Database& db, const std::string& sql) {
  char* error = nullptr;
  if (sqlite3_exec(db.getHandle(), sql.c_str(), nullptr, nullptr, &error) != SQLITE_OK) {
    const std::string message = error ? error : "unknown error";
    sqlite3_free(error);
    FAIL("sqlite3_exec failed: " << sql << ": " << message);
  }
}

/// Drops the append-only triggers of `table`, as a tamperer would.
void drop_triggers(SQLite::Database& db, const std::string& table) {
  std::vector<std::string> names;
  SQLite::Statement q(db, "SELECT name FROM sqlite_master WHERE type = 'trigger' AND tbl_name = ?");
  q.bind(1, table);
  while (q.executeStep()) names.push_back(q.getColumn(0).getString());
  for (const auto& n : names) exec(db, "DROP TRIGGER " + n);
}

struct Column {
  std::string name, type;
  int pk = 0;
};

std::vector<Column> columns_of(SQLite::Database& db, const std::string& table) {
  std::vector<Column> out;
  SQLite::Statement q(db, "PRAGMA table_info(" + table + ")");
  while (q.executeStep())
    out.push_back({q.getColumn(1).getString(), q.getColumn(2).getString(), q.getColumn(5).getInt()});
  return out;
}

/// A plausible forged value: one digit changed (or a character added), an integer moved, a NULL filled in.
struct Forged {
  bool is_null = false, is_int = false;
  std::int64_t i = 0;
  std::string s;
};

Forged forge(const SQLite::Column& old, const std::string& type, std::mt19937& rng) {
  Forged f;
  if (old.isNull()) {
    f.is_int = type == "INTEGER";
    f.i = 1;
    f.s = "2026-12-01";
  } else if (old.isInteger()) {
    f.is_int = true;
    f.i = old.getInt64() + 1 + static_cast<std::int64_t>(rng() % 7);
  } else {
    f.s = old.getString();
    std::vector<std::size_t> digits;
    for (std::size_t k = 0; k < f.s.size(); ++k)
      if (f.s[k] >= '0' && f.s[k] <= '9') digits.push_back(k);
    if (digits.empty()) {
      f.s += "x";
    } else {
      const std::size_t k = digits[rng() % digits.size()];
      f.s[k] = static_cast<char>('0' + (f.s[k] - '0' + 1) % 10);
    }
  }
  return f;
}

std::string text_of(const SQLite::Column& c) {
  return c.isInteger() ? std::to_string(c.getInt64()) : c.getString();
}

std::vector<std::string> audited_tables(SQLite::Database& db) {
  std::vector<std::string> out;
  SQLite::Statement q(db,
                      "SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' AND "
                      "name NOT IN ('audit_log', 'checkpoints') ORDER BY name");  // checkpoints are proved apart
  while (q.executeStep()) out.push_back(q.getColumn(0).getString());
  return out;
}

std::int64_t count(SQLite::Database& db, const std::string& sql) {
  return db.execAndGet(sql).getInt64();
}

}  // namespace

TEST_CASE("audit verify passes an untouched database and reports what it checked", "[audit]") {
  test::ScratchDir dir;
  store::Database db(dir.file("lab.db"), store::Database::Open::create);
  build_lab(db);
  const auto v = store::verify_audit_trail(db.sql());
  INFO((v.problems.empty() ? "" : v.problems.front().message));
  REQUIRE(v.ok());
  // Every table row is described by exactly one audit record: a single-row record ("insert") or one of the
  // rows of a grouped record ("insert rows": a check run with its weights and readings). Both counted
  // independently here.
  std::int64_t rows = 0;
  for (const auto& t : audited_tables(db.sql())) rows += count(db.sql(), "SELECT count(*) FROM " + t);
  std::int64_t described = 0, grouped = 0;
  SQLite::Statement trail(db.sql(), "SELECT action, after_json FROM audit_log");
  while (trail.executeStep()) {
    const auto after = nlohmann::json::parse(trail.getColumn(1).getString());
    if (trail.getColumn(0).getString() == "insert") {
      ++described;
      continue;
    }
    REQUIRE(trail.getColumn(0).getString() == "insert rows");
    ++grouped;
    for (const auto& [table, block] : after.items()) described += static_cast<std::int64_t>(block["rows"].size());
  }
  CHECK(grouped == 3);  // two checks and the correction
  CHECK(v.rows == rows);
  CHECK(v.records == count(db.sql(), "SELECT count(*) FROM audit_log"));
  CHECK(described == rows);
  CHECK(v.last_hash == db.sql().execAndGet("SELECT hash FROM audit_log ORDER BY seq DESC LIMIT 1").getString());
}

TEST_CASE("audit verify catches one changed field of any row of any table and names table, key and field",
          "[audit][tamper]") {
  test::ScratchDir dir;
  store::Database db(dir.file("lab.db"), store::Database::Open::create);
  build_lab(db);
  SQLite::Database& sql = db.sql();
  exec(sql, "PRAGMA foreign_keys = OFF");  // a tamperer's own connection does not enforce them
  const auto tables = audited_tables(sql);
  std::mt19937 rng(20261130);  // fixed seed: the same 120 tampers every run
  std::map<std::string, int> caught_per_table;
  int caught = 0, attempts = 0;
  while (caught < 120 && attempts < 2000) {
    ++attempts;
    const std::string& table = tables[rng() % tables.size()];
    const auto rows = count(sql, "SELECT count(*) FROM " + table);
    if (rows == 0) continue;
    const auto cols = columns_of(sql, table);
    const Column& col = cols[rng() % cols.size()];
    SQLite::Statement pick(sql, "SELECT rowid, * FROM " + table + " ORDER BY rowid LIMIT 1 OFFSET ?");
    pick.bind(1, static_cast<std::int64_t>(rng() % static_cast<std::uint64_t>(rows)));
    REQUIRE(pick.executeStep());
    const std::int64_t rowid = pick.getColumn(0).getInt64();
    // The key the report must name, built from the primary key columns of the untouched row.
    std::string key;
    for (int n = 1; n <= 2; ++n)
      for (std::size_t c = 0; c < cols.size(); ++c)
        if (cols[c].pk == n)
          key += (key.empty() ? "" : ",") + cols[c].name + "=" + text_of(pick.getColumn(static_cast<int>(c) + 1));
    std::size_t index = 0;
    while (cols[index].name != col.name) ++index;
    const Forged f = forge(pick.getColumn(static_cast<int>(index) + 1), col.type, rng);
    pick.reset();

    exec(sql, "SAVEPOINT tamper");
    drop_triggers(sql, table);
    sqlite3_stmt* update = nullptr;
    const std::string text = "UPDATE " + table + " SET " + col.name + " = ? WHERE rowid = ?";
    REQUIRE(sqlite3_prepare_v2(sql.getHandle(), text.c_str(), -1, &update, nullptr) == SQLITE_OK);
    if (f.is_int)
      sqlite3_bind_int64(update, 1, f.i);
    else
      sqlite3_bind_text(update, 1, f.s.c_str(), static_cast<int>(f.s.size()), SQLITE_TRANSIENT);
    sqlite3_bind_int64(update, 2, rowid);
    const int rc = sqlite3_step(update);
    sqlite3_finalize(update);
    if (rc != SQLITE_DONE || sqlite3_changes(sql.getHandle()) != 1) {  // a CHECK or key constraint: choose again
      exec(sql, "ROLLBACK TO tamper; RELEASE tamper");
      continue;
    }
    const auto v = store::verify_audit_trail(sql);
    exec(sql, "ROLLBACK TO tamper; RELEASE tamper");

    INFO("tamper " << caught + 1 << ": " << table << " " << key << " field " << col.name);
    REQUIRE_FALSE(v.ok());
    const auto& first = v.problems.front();
    INFO(first.message);
    CHECK(first.kind == Kind::field_mismatch);
    CHECK(first.table == table);
    CHECK(first.key == key);
    CHECK(first.field == col.name);
    CHECK_THAT(first.message, Catch::Contains(table) && Catch::Contains(key) && Catch::Contains("field " + col.name));
    ++caught;
    ++caught_per_table[table];
  }
  CHECK(caught == 120);
  // Each of plumb's own audited tables was tampered with at least once (others' tables may be empty).
  for (const char* t : {"lab", "weights", "weight_calibrations", "instruments", "balances", "check_runs", "run_weights",
                        "readings", "certificates", "certificate_events", "service_events"}) {
    INFO(t);
    CHECK(caught_per_table[t] > 0);
  }
  // All rolled back: the database verifies again.
  CHECK(store::verify_audit_trail(sql).ok());
}

TEST_CASE("audit verify catches deleted, reordered, altered and forged audit records and rows", "[audit][tamper]") {
  test::ScratchDir dir;
  store::Database db(dir.file("lab.db"), store::Database::Open::create);
  build_lab(db);
  SQLite::Database& sql = db.sql();
  const auto last = count(sql, "SELECT max(seq) FROM audit_log");
  REQUIRE(last > 12);
  const auto tampered = [&](const std::string& table, const std::string& statements) {
    exec(sql, "SAVEPOINT tamper");
    drop_triggers(sql, table);
    exec(sql, statements);
    auto v = store::verify_audit_trail(sql);
    exec(sql, "ROLLBACK TO tamper; RELEASE tamper");
    REQUIRE_FALSE(v.ok());
    INFO(v.problems.front().message);
    return v;
  };

  SECTION("an audit record deleted from the middle") {
    const auto v = tampered("audit_log", "DELETE FROM audit_log WHERE seq = 7");
    CHECK(v.problems.front().kind == Kind::missing_record);
    CHECK(v.problems.front().seq == 7);
    CHECK_THAT(v.problems.front().message, Catch::Contains("audit record 7 is missing"));
  }
  SECTION("the last audit record deleted: its row is left undescribed") {
    const std::string table =
        sql.execAndGet("SELECT table_name FROM audit_log WHERE seq = " + std::to_string(last)).getString();
    const std::string key =
        sql.execAndGet("SELECT row_key FROM audit_log WHERE seq = " + std::to_string(last)).getString();
    const auto v = tampered("audit_log", "DELETE FROM audit_log WHERE seq = " + std::to_string(last));
    // The last signed checkpoint still counts the deleted record (doc/audit-trail.md, "Checkpoints") ...
    CHECK(v.problems.front().kind == Kind::checkpoint);
    CHECK_THAT(v.problems.front().message, Catch::Contains("audit record " + std::to_string(last) + " was deleted"));
    // ... and the record's row is left undescribed.
    CHECK(std::any_of(v.problems.begin(), v.problems.end(), [&](const store::AuditProblem& p) {
      return p.kind == Kind::unaudited_row && p.table == table && p.key == key;
    }));
  }
  SECTION("two audit records reordered") {
    const auto v = tampered("audit_log",
                            "UPDATE audit_log SET seq = -1 WHERE seq = 5; "
                            "UPDATE audit_log SET seq = 5 WHERE seq = 9; "
                            "UPDATE audit_log SET seq = 9 WHERE seq = -1");
    CHECK(v.problems.front().kind == Kind::broken_link);
    CHECK(v.problems.front().seq == 5);
    CHECK_THAT(v.problems.front().message, Catch::Contains("reordered"));
  }
  SECTION("an audit record's who changed") {
    const auto v = tampered("audit_log", "UPDATE audit_log SET actor = 'B. Someone' WHERE seq = 12");
    CHECK(v.problems.front().kind == Kind::altered_record);
    CHECK(v.problems.front().seq == 12);
  }
  SECTION("a row and its audit record changed together, the hash left alone") {
    // Reading 2 of run 1 is recorded inside run 1's grouped record as [run_id,seq,series,text,...].
    const auto v = tampered("readings",
                            "DROP TRIGGER audit_log_no_update; "
                            "UPDATE readings SET text = '100.0009' WHERE run_id = 1 AND seq = 2; "
                            "UPDATE audit_log SET after_json = replace(after_json, "
                            "'[1,2,\"\",\"100.0001\"', '[1,2,\"\",\"100.0009\"') "
                            "WHERE table_name = 'check_runs' AND row_key = 'id=1'");
    CHECK(v.problems.front().kind == Kind::altered_record);
    CHECK(v.problems.front().table == "check_runs");
    CHECK(v.problems.front().key == "id=1");
    // Only the record's hash gives it away: the row and what the record now says agree (the dropped triggers are
    // named too, as schema problems).
    CHECK(std::count_if(v.problems.begin(), v.problems.end(),
                        [](const store::AuditProblem& p) { return p.kind != Kind::schema; }) == 1);
  }
  SECTION("a row inserted behind plumb's back") {
    const auto v = tampered("readings",
                            "INSERT INTO readings (run_id, seq, series, text, unit, units, scale) "
                            "VALUES (1, 11, '', '100.0002', 'g', 1000002, 4)");
    CHECK(v.problems.front().kind == Kind::unaudited_row);
    CHECK(v.problems.front().table == "readings");
    CHECK(v.problems.front().key == "run_id=1,seq=11");
  }
  SECTION("a row deleted") {
    const auto v = tampered("readings", "DELETE FROM readings WHERE run_id = 1 AND seq = 4");
    CHECK(v.problems.front().kind == Kind::row_missing);
    CHECK(v.problems.front().table == "readings");
    CHECK(v.problems.front().key == "run_id=1,seq=4");
    CHECK_THAT(v.problems.front().message, Catch::Contains("missing from the table"));
  }
  CHECK(store::verify_audit_trail(sql).ok());
}

namespace {

/// Appends one audit record the way plumb wrote every row before a run's rows were grouped: action "insert",
/// the whole row read back as a JSON object (long texts copied in full), chained with
/// SHA-256(previous hash + "\n" + the record's JSON with sorted keys) as the schema comment describes.
void append_per_row_record(SQLite::Database& sql, const std::string& table, const std::string& where,
                           const std::string& key) {
  SQLite::Statement row(sql, "SELECT * FROM " + table + " WHERE " + where);
  REQUIRE(row.executeStep());
  nlohmann::json after = nlohmann::json::object();
  for (int i = 0; i < row.getColumnCount(); ++i) {
    const SQLite::Column c = row.getColumn(i);
    if (c.isNull())
      after[c.getName()] = nullptr;
    else if (c.isInteger())
      after[c.getName()] = c.getInt64();
    else
      after[c.getName()] = c.getString();
  }
  SQLite::Statement tail(sql, "SELECT seq, hash FROM audit_log ORDER BY seq DESC LIMIT 1");
  REQUIRE(tail.executeStep());
  const std::int64_t seq = tail.getColumn(0).getInt64() + 1;
  const std::string prev = tail.getColumn(1).getString();
  tail.reset();
  nlohmann::json record = {{"seq", seq},         {"at", "2026-06-01T09:00:00Z"}, {"os_user", "tech"},
                           {"actor", "A. Tech"}, {"action", "insert"},           {"table_name", table},
                           {"row_key", key},     {"before_json", nullptr},       {"after_json", after.dump()},
                           {"reason", nullptr}};
  const std::string hash = store::sha256_hex(prev + "\n" + record.dump());
  SQLite::Statement insert(sql,
                           "INSERT INTO audit_log (seq, at, os_user, actor, action, table_name, row_key, "
                           "before_json, after_json, reason, prev_hash, hash) "
                           "VALUES (?, ?, ?, ?, 'insert', ?, ?, NULL, ?, NULL, ?, ?)");
  insert.bind(1, seq);
  insert.bind(2, "2026-06-01T09:00:00Z");
  insert.bind(3, "tech");
  insert.bind(4, "A. Tech");
  insert.bind(5, table);
  insert.bind(6, key);
  insert.bind(7, after.dump());
  insert.bind(8, prev);
  insert.bind(9, hash);
  insert.exec();
}

}  // namespace

TEST_CASE("a trail written one record per row, as before runs were grouped, still verifies and still catches tampering",
          "[audit][tamper]") {
  // A database written by an earlier plumb: the run, its weight link and each reading carry an audit record of
  // their own, with the stored results (about 1 KB) copied in full rather than by digest. Grouped records
  // follow in the same trail.
  test::ScratchDir dir;
  store::Database db(dir.file("lab.db"), store::Database::Open::create);
  build_lab(db);
  SQLite::Database& sql = db.sql();
  const std::int64_t run = count(sql, "SELECT max(id) FROM check_runs") + 1;
  const std::string results =
      R"({"n":10,"mean_g":100.00023,"verdict":"pass","readability_statement":")" + std::string(300, 'x') + R"("})";
  REQUIRE(results.size() > store::long_text_bytes);
  exec(sql, "BEGIN");
  SQLite::Statement run_row(sql,
                            "INSERT INTO check_runs (id, instrument_id, procedure, performed_on, operator, "
                            "results_json, verdict, next_due, recorded_at, os_user) VALUES (?, 'BAL-A', "
                            "'repeatability', '2026-05-31', 'A. Tech', ?, 'pass', '2026-06-07', "
                            "'2026-06-01T09:00:00Z', 'tech')");
  run_row.bind(1, run);
  run_row.bind(2, results);
  run_row.exec();
  append_per_row_record(sql, "check_runs", "id = " + std::to_string(run), "id=" + std::to_string(run));
  exec(sql, "INSERT INTO run_weights (run_id, position, weight_id, weight_calibration_id) VALUES (" +
                std::to_string(run) + ", 1, 'W100', 1)");
  append_per_row_record(sql, "run_weights", "run_id = " + std::to_string(run) + " AND position = 1",
                        "run_id=" + std::to_string(run) + ",position=1");
  for (int seq = 1; seq <= 10; ++seq) {
    exec(sql, "INSERT INTO readings (run_id, seq, text, unit, units, scale) VALUES (" + std::to_string(run) + ", " +
                  std::to_string(seq) + ", '100.000" + std::to_string(seq % 10) + "', 'g', " +
                  std::to_string(1000000 + seq % 10) + ", 4)");
    append_per_row_record(sql, "readings", "run_id = " + std::to_string(run) + " AND seq = " + std::to_string(seq),
                          "run_id=" + std::to_string(run) + ",seq=" + std::to_string(seq));
  }
  exec(sql, "COMMIT");
  // And a grouped record after them, as the current plumb writes.
  app::CheckInput c;
  c.instrument_id = "BAL-A";
  c.weight_ids = {"W100"};
  c.readings_csv = good_readings;
  c.readings_source = "r.csv";
  c.on = "2026-11-30";
  c.operator_name = "A. Technician";
  app::record_check(db, {"A. Technician", "tech"}, c);

  const auto v = store::verify_audit_trail(sql);
  INFO((v.problems.empty() ? "" : v.problems.front().message));
  CHECK(v.ok());
  std::int64_t rows = 0;
  for (const auto& t : audited_tables(sql)) rows += count(sql, "SELECT count(*) FROM " + t);
  CHECK(v.rows == rows);

  exec(sql, "PRAGMA foreign_keys = OFF");
  const auto tampered = [&](const std::string& table, const std::string& update) {
    exec(sql, "SAVEPOINT tamper");
    drop_triggers(sql, table);
    exec(sql, update);
    const auto result = store::verify_audit_trail(sql);
    exec(sql, "ROLLBACK TO tamper; RELEASE tamper");
    REQUIRE_FALSE(result.ok());
    return result.problems.front();
  };
  const auto reading = tampered(
      "readings", "UPDATE readings SET text = '100.0009' WHERE run_id = " + std::to_string(run) + " AND seq = 3");
  CHECK(reading.kind == Kind::field_mismatch);
  CHECK(reading.table == "readings");
  CHECK(reading.key == "run_id=" + std::to_string(run) + ",seq=3");
  CHECK(reading.field == "text");
  // The long results text was recorded in full: one changed character is caught against the copy.
  const auto stored = tampered("check_runs",
                               "UPDATE check_runs SET results_json = replace(results_json, "
                               "'100.00023', '100.00024') WHERE id = " +
                                   std::to_string(run));
  CHECK(stored.kind == Kind::field_mismatch);
  CHECK(stored.key == "id=" + std::to_string(run));
  CHECK(stored.field == "results_json");
  CHECK(store::verify_audit_trail(sql).ok());
}
