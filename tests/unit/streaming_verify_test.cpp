// `audit verify` walks the trail and each table once, side by side (store/row_verification): these are the cases
// that leave that merge, where a table's rows are not in the trail's order or a record describes a row twice, and
// the reading of a record's rows without a JSON document (store/recorded_blocks) against nlohmann's own parser.
#include <sqlite3.h>
#include <catch2/catch.hpp>

#include <algorithm>

#include "app/registry/balances.hpp"
#include "app/registry/lab.hpp"
#include "app/registry/weights.hpp"
#include "app/weekly_check/record.hpp"
#include "store/audit_trail.hpp"
#include "store/recorded_blocks.hpp"
#include "support/insider.hpp"
#include "support/registry_inputs.hpp"
#include "support/run_plumb.hpp"
#include "support/test_accounts.hpp"

using namespace plumb;
using Kind = store::AuditProblem::Kind;
using nlohmann::json;

namespace {

/// Rows as nlohmann's document parser reads them (store::recorded_rows), to compare the event reader with.
std::vector<std::pair<std::string, json>> document_rows(const std::string& action, const std::string& table,
                                                        const std::string& after) {
  store::AuditRecord r;
  r.action = action;
  r.table_name = table;
  r.after_json = after;
  std::vector<std::pair<std::string, json>> out;
  for (auto& [t, row] : store::recorded_rows(r)) out.emplace_back(t, row);
  return out;
}

std::vector<std::pair<std::string, json>> event_rows(store::RecordedBlocks& blocks, const std::string& action,
                                                     const std::string& table, const std::string& after) {
  blocks.read(action, table, after);
  std::vector<std::pair<std::string, json>> out;
  for (std::size_t b = 0; b < blocks.size(); ++b)
    for (std::size_t r = 0; r < blocks[b].row_count; ++r) out.emplace_back(blocks[b].table, blocks[b].row_json(r));
  return out;
}

const std::string readings_csv =
    "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0002\n";

/// A lab with three weekly checks of one balance (30 readings in three grouped records).
void three_checks(store::Database& db) {
  app::init_lab(db, {"Q. Manager", "qm"}, "Example Analytical Lab");
  test::TestAccounts accounts(db);
  const store::Actor manager = accounts.add("qman", "Q. Manager", {"quality manager"});
  app::add_weight(db, manager, test::e2_weight("W100", "100g", "RC-2291", "2026-03-02", "2027-03-02"));
  app::add_balance(db, manager, test::usp41_balance("BAL-A", "7d", "2026-01-05"));
  for (const char* on : {"2026-11-09", "2026-11-16", "2026-11-23"}) {
    app::CheckInput c;
    c.instrument_id = "BAL-A";
    c.weight_ids = {"W100"};
    c.readings_csv = readings_csv;
    c.readings_source = "r.csv";
    c.on = on;
    c.operator_name = "A. Technician";
    app::record_check(db, {"A. Technician", "tech"}, c);
  }
}

void run_sql(SQLite::Database& db, const std::string& sql) {
  char* error = nullptr;
  if (sqlite3_exec(db.getHandle(), sql.c_str(), nullptr, nullptr, &error) != SQLITE_OK) {
    const std::string message = error ? error : "unknown error";
    sqlite3_free(error);
    FAIL("sqlite3_exec failed: " << sql << ": " << message);
  }
}

/// Runs `sql` with the triggers of readings and audit_log dropped, verifies, and rolls it all back.
store::AuditVerification verified_after(SQLite::Database& db, const std::string& sql) {
  run_sql(db, "SAVEPOINT tamper");
  std::vector<std::string> triggers;
  SQLite::Statement q(db, "SELECT name FROM sqlite_master WHERE type = 'trigger'");
  while (q.executeStep()) triggers.push_back(q.getColumn(0).getString());
  for (const auto& t : triggers) run_sql(db, "DROP TRIGGER " + t);
  run_sql(db, sql);
  auto v = store::verify_audit_trail(db);
  run_sql(db, "ROLLBACK TO tamper; RELEASE tamper");
  return v;
}

std::vector<store::AuditProblem> not_schema(const store::AuditVerification& v) {
  std::vector<store::AuditProblem> out;
  std::copy_if(v.problems.begin(), v.problems.end(), std::back_inserter(out),
               [](const store::AuditProblem& p) { return p.kind != Kind::schema; });
  return out;
}

}  // namespace

TEST_CASE("a record's rows read event by event are the rows nlohmann's document parser reads", "[audit][trail]") {
  // The reference is nlohmann::json::parse (through store::recorded_rows): for the shape the Recorder writes and for
  // every departure from it an altered record may hold, both readings must give the same rows.
  store::RecordedBlocks blocks;
  const std::vector<std::pair<std::string, std::string>> cases = {
      {"insert rows",
       R"({"check_runs":{"columns":["id","note"],"rows":[[7,"a \"quoted\" text"]]},)"
       R"("readings":{"columns":["run_id","seq","text"],"rows":[[7,1,"100.0003"],[7,2,null],[7,3,{"sha256":"ab"}]]}})"},
      {"insert rows",  // the Recorder's order of tables (run, weights, readings): the document parser sorts them
       R"({"check_runs":{"columns":["id"],"rows":[[8]]},"run_weights":{"columns":["run_id","position"],"rows":[[8,1]]},)"
       R"("readings":{"columns":["run_id","seq"],"rows":[[8,1],[8,2]]}})"},
      {"insert", R"({"id":3,"name":"BAL-A","notes":null,"results_json":{"sha256":"00ff"}})"},
      {"insert", R"({"id":3,"id":4})"},                    // a repeated column: the last one counts
      {"insert", R"({"id":3.5,"flag":true})"},             // values the Recorder never writes
      {"insert", R"({"id":18446744073709551615})"},        // beyond a 64-bit signed integer
      {"insert", R"({"text":{"sha256":"ab","also":1}})"},  // a digest with something beside it
      {"insert rows", R"({"readings":{"rows":[[1,2]],"columns":["a","b"]}})"},            // the keys in another order
      {"insert rows", R"({"readings":{"columns":["a","b"],"rows":[[1,2],[3],[4,5]]}})"},  // a row short of a value
      {"insert rows", R"({"readings":{"columns":["a","b"],"rows":[[1,2]]},"readings":{"columns":["a"],"rows":[[9]]}})"},
      {"insert rows", R"({"readings":[1,2]})"},
      {"insert", R"([1,2])"},
      {"insert", R"({"id":3)"},  // not JSON at all
      {"insert", ""},
      {"update", R"({"id":3})"},  // not an insert: describes no row
  };
  for (const auto& [action, after] : cases) {
    INFO(action << " " << after);
    CHECK(event_rows(blocks, action, "instruments", after) == document_rows(action, "instruments", after));
  }
}

TEST_CASE("audit verify finds a row the table holds out of the trail's order", "[audit][tamper]") {
  test::ScratchDir dir;
  store::Database db(dir.file("lab.db"), store::Database::Open::create);
  three_checks(db);
  SQLite::Database& sql = db.sql();
  REQUIRE(store::verify_audit_trail(sql).ok());

  SECTION(
      "a reading deleted and written again unchanged moves to the end of the table, and is still what was recorded") {
    const auto v = verified_after(sql,
                                  "CREATE TEMP TABLE moved AS SELECT * FROM readings WHERE run_id = 1 AND seq = 4; "
                                  "DELETE FROM readings WHERE run_id = 1 AND seq = 4; "
                                  "INSERT INTO readings SELECT * FROM moved; DROP TABLE moved");
    CHECK(not_schema(v).empty());
  }
  SECTION("a reading written again with another value is named by table, key and field") {
    const auto v = verified_after(sql,
                                  "CREATE TEMP TABLE moved AS SELECT * FROM readings WHERE run_id = 2 AND seq = 3; "
                                  "DELETE FROM readings WHERE run_id = 2 AND seq = 3; "
                                  "UPDATE moved SET text = '100.0009'; "
                                  "INSERT INTO readings SELECT * FROM moved; DROP TABLE moved");
    const auto p = not_schema(v);
    REQUIRE(p.size() == 1);
    CHECK(p[0].kind == Kind::field_mismatch);
    CHECK(p[0].table == "readings");
    CHECK(p[0].key == "run_id=2,seq=3");
    CHECK(p[0].field == "text");
    CHECK_THAT(p[0].message, Catch::Contains("\"100.0009\" in the table but \"100.0002\" was recorded"));
  }
  SECTION("a reading's key changed is one changed field, not a missing and an extra row") {
    const auto v = verified_after(sql, "UPDATE readings SET seq = 40 WHERE run_id = 1 AND seq = 4");
    const auto p = not_schema(v);
    REQUIRE(p.size() == 1);
    CHECK(p[0].kind == Kind::field_mismatch);
    CHECK(p[0].key == "run_id=1,seq=4");
    CHECK(p[0].field == "seq");
  }
  SECTION("a reading missing and another added in a different run are each named") {
    const auto v = verified_after(sql,
                                  "DELETE FROM readings WHERE run_id = 3 AND seq = 10; "
                                  "INSERT INTO readings (run_id, seq, series, text, unit, units, scale) "
                                  "VALUES (1, 11, 'x', '99.9', 'mg', 999, 1)");
    const auto p = not_schema(v);
    REQUIRE(p.size() == 2);
    CHECK(p[0].kind == Kind::row_missing);
    CHECK(p[0].key == "run_id=3,seq=10");
    CHECK(p[1].kind == Kind::unaudited_row);
    CHECK(p[1].key == "run_id=1,seq=11");
  }
}

TEST_CASE("audit verify names the first record of a row described twice", "[audit][tamper]") {
  // An insider copies run 1's audit record to the end of the trail and recomputes the chain: every row of the run
  // is then described twice, and each is named with the record that described it first.
  test::ScratchDir dir;
  const auto file = dir.file("lab.db");
  std::int64_t first = 0, copy = 0;
  {
    store::Database db(file, store::Database::Open::create);
    three_checks(db);
  }
  test::insider_rewrite(file, [&](SQLite::Database& sql) {
    first = sql.execAndGet("SELECT seq FROM audit_log WHERE table_name = 'check_runs' AND row_key = 'id=1'").getInt64();
    copy = sql.execAndGet("SELECT max(seq) + 1 FROM audit_log").getInt64();
    run_sql(sql,
            "INSERT INTO audit_log (seq, at, os_user, actor, action, table_name, row_key, before_json, after_json, "
            "reason, prev_hash, hash, user_id) SELECT " +
                std::to_string(copy) +
                ", at, os_user, actor, action, table_name, row_key, before_json, after_json, reason, '', '', user_id "
                "FROM audit_log WHERE seq = " +
                std::to_string(first));
  });
  store::Database db(file, store::Database::Open::existing);
  const auto v = store::verify_audit_trail(db.sql());
  std::vector<store::AuditProblem> duplicates;
  std::copy_if(v.problems.begin(), v.problems.end(), std::back_inserter(duplicates),
               [](const store::AuditProblem& p) { return p.kind == Kind::duplicate_record; });
  // The run, its weight and its ten readings.
  REQUIRE(duplicates.size() == 12);
  for (const auto& d : duplicates) {
    CHECK(d.seq == copy);
    CHECK_THAT(d.message,
               Catch::EndsWith("the same row was already recorded by audit record " + std::to_string(first) + "."));
  }
  CHECK(std::any_of(duplicates.begin(), duplicates.end(),
                    [](const store::AuditProblem& d) { return d.table == "readings" && d.key == "run_id=1,seq=10"; }));
  // The copy is after the last signed checkpoint.
  CHECK(std::any_of(v.problems.begin(), v.problems.end(),
                    [](const store::AuditProblem& p) { return p.kind == Kind::unsigned_records; }));
}
