// The history import in the app layer: a run older than a weight's current certificate is traced to the
// certificate that was valid on its date, and a failed import leaves nothing behind.
#include <SQLiteCpp/Statement.h>
#include <SQLiteCpp/Transaction.h>

#include <catch2/catch.hpp>
#include <fmt/format.h>

#include "app/runs/import.hpp"
#include "app/registry/weights.hpp"
#include "app/registry/balances.hpp"
#include "app/registry/lab.hpp"
#include "core/errors.hpp"
#include "store/audit_trail.hpp"
#include "store/repository.hpp"
#include "support/run_plumb.hpp"
#include "support/registry_inputs.hpp"

using namespace plumb;

namespace {

const store::Actor quality{"Q. Manager", "tester"};

/// One run of ten readings (USP <41> asks for not less than 10 replicate weighings).
std::string rows(const std::string& date) {
  std::string csv;
  for (const char* r : {"100.0003", "100.0001", "100.0002", "100.0002", "100.0003", "100.0001", "100.0002", "100.0004",
                        "100.0002", "100.0003"})
    csv += std::string("BAL-H,repeatability,") + date + ",A. Technician,W1," + r + ",g\n";
  return csv;
}

/// A lab with reference weight W1 (100 g, E2, one certificate from 2024-01-10 to 2025-01-10); returns it.
store::WeightRecord lab_with_weight(store::Database& db, const std::string& certificate) {
  app::init_lab(db, quality, "History Lab");
  return app::add_weight(db, quality, test::e2_weight("W1", "100g", certificate, "2024-01-10", "2025-01-10"));
}

void add_usp41_balance(store::Database& db, const std::string& id, const std::string& every, const std::string& since) {
  app::add_balance(db, quality, test::usp41_balance(id, every, since));
}

std::int64_t certificate_of_run(store::Database& db, std::int64_t run) {
  SQLite::Statement q(db.sql(), "SELECT weight_calibration_id FROM run_weights WHERE run_id = ?");
  q.bind(1, run);
  REQUIRE(q.executeStep());
  return q.getColumn(0).getInt64();
}

}  // namespace

TEST_CASE("imported runs are traced to the certificate valid on their date", "[import]") {
  test::ScratchDir dir;
  store::Database db(dir.file("lab.db"), store::Database::Open::create);
  const auto first = lab_with_weight(db, "OLD-1");
  {
    // The weight's recalibration: a second certificate, now the current one.
    SQLite::Transaction tx(db.sql());
    store::Recorder rec(db.sql(), quality);
    store::WeightCalibration c = first.current;
    c.certificate_no = "NEW-2";
    c.calibrated_on = parse_date("2025-02-03");
    c.due_on = parse_date("2026-02-03");
    store::add_weight_calibration(rec, "W1", c);
    rec.commit(tx);  // signed like every command
  }
  add_usp41_balance(db, "BAL-H", "6mo", "2023-12-01");
  const std::int64_t old_id = first.current.id;
  const std::int64_t new_id = store::find_weight(db.sql(), "W1")->current.id;
  REQUIRE(old_id != new_id);

  dir.write("h.csv", "instrument,procedure,date,operator,weight,reading,unit\n" + rows("2024-06-03") +
                         rows("2025-06-02"));
  const auto report = app::import_history(db, quality, dir.file("h.csv"), "h.csv");
  REQUIRE(report.runs == 2);
  CHECK(certificate_of_run(db, report.first_run_id) == old_id);
  CHECK(certificate_of_run(db, report.last_run_id) == new_id);

  // A run after the old certificate ran out and before the new one began has no valid certificate:
  // the whole second file is refused, its good first run included.
  dir.write("late.csv", "instrument,procedure,date,operator,weight,reading,unit\n" + rows("2024-09-02") +
                            rows("2025-01-07") + rows("2025-01-20"));
  try {
    app::import_history(db, quality, dir.file("late.csv"), "late.csv");
    FAIL("the import should have been refused");
  } catch (const InputError& e) {
    CHECK_THAT(e.what(), Catch::Contains("late.csv line 22 (run of BAL-H on 2025-01-20)"));
    CHECK_THAT(e.what(), Catch::Contains("W1 was due for calibration on 2025-01-10"));
  }
  SQLite::Statement count(db.sql(), "SELECT count(*) FROM check_runs");
  REQUIRE(count.executeStep());
  CHECK(count.getColumn(0).getInt() == 2);
}

TEST_CASE("a long import goes through both threads in file order, all or nothing", "[import][threads]") {
  // 2,000 runs are eight chunks of 256: the preparing thread runs ahead of the writing one and hands chunks
  // over, which a ThreadSanitizer build (.ci/run) watches. What must hold whatever the timing: every run and
  // reading is stored as in the file, in file order, the trail verifies, and a bad row near the end leaves
  // nothing behind.
  test::ScratchDir dir;
  store::Database db(dir.file("lab.db"), store::Database::Open::create);
  lab_with_weight(db, "C-1");
  for (int k = 0; k < 10; ++k) add_usp41_balance(db, "BAL-" + std::to_string(k), "7d", "2024-01-15");
  // Run k: balance k % 10, day k / 10 after 2024-02-01, ten readings (USP <41>: not less than 10) whose last
  // digit follows k.
  const auto file_of = [](int runs, int bad_run) {
    std::string csv = "instrument,procedure,date,operator,weight,reading,unit\n";
    for (int k = 0; k < runs; ++k) {
      const std::string date = to_string(add_days(parse_date("2024-02-01"), k / 10));
      for (int r = 0; r < 10; ++r) {
        const std::string reading = k == bad_run && r == 2 ? "100.00001" : "100.000" + std::to_string((k + r) % 10);
        csv += fmt::format("BAL-{},repeatability,{},A. Technician,W1,{},g\n", k % 10, date, reading);
      }
    }
    return csv;
  };
  dir.write("long.csv", file_of(2000, -1));
  const auto report = app::import_history(db, quality, dir.file("long.csv"), "long.csv");
  REQUIRE(report.runs == 2000);
  CHECK(report.readings == 20000);
  const auto count = [&](const std::string& sql) { return db.sql().execAndGet(sql).getInt64(); };
  CHECK(count("SELECT count(*) FROM check_runs") == 2000);
  CHECK(count("SELECT count(*) FROM readings") == 20000);
  // Run ids follow the file: run k is id first + k, on balance k % 10, with the readings of the file.
  long long misplaced = 0;
  SQLite::Statement q(db.sql(), "SELECT r.id, r.instrument_id, r.performed_on, d.seq, d.text FROM check_runs r "
                                "JOIN readings d ON d.run_id = r.id ORDER BY r.id, d.seq");
  while (q.executeStep()) {
    const int k = static_cast<int>(q.getColumn(0).getInt64() - report.first_run_id);
    const int r = q.getColumn(3).getInt() - 1;
    if (q.getColumn(1).getString() != "BAL-" + std::to_string(k % 10) ||
        q.getColumn(2).getString() != to_string(add_days(parse_date("2024-02-01"), k / 10)) ||
        q.getColumn(4).getString() != "100.000" + std::to_string((k + r) % 10))
      ++misplaced;
  }
  CHECK(misplaced == 0);
  // One audit record per run, in the same order as the runs.
  CHECK(count("SELECT count(*) FROM audit_log WHERE action = 'insert rows'") == 2000);
  CHECK(count("SELECT count(*) FROM (SELECT seq, row_key, lag(row_key) OVER (ORDER BY seq) AS before FROM audit_log "
              "WHERE action = 'insert rows') WHERE before IS NOT NULL AND "
              "CAST(substr(row_key, 4) AS INTEGER) <> CAST(substr(before, 4) AS INTEGER) + 1") == 0);
  CHECK(store::verify_audit_trail(db.sql()).ok());

  // A reading finer than the readability, the third of run 1,900 (line 2 + 10 x 1,900 + 2 = 19,004): refused
  // with its line, nothing written.
  const auto trail = count("SELECT count(*) FROM audit_log");
  dir.write("bad.csv", file_of(2000, 1900));
  try {
    app::import_history(db, quality, dir.file("bad.csv"), "bad.csv");
    FAIL("the import should have been refused");
  } catch (const InputError& e) {
    CHECK_THAT(e.what(), Catch::Contains("bad.csv line 19004"));
  }
  CHECK(count("SELECT count(*) FROM check_runs") == 2000);
  CHECK(count("SELECT count(*) FROM audit_log") == trail);
  // The same good file again is refused before anything is written.
  CHECK_THROWS_WITH(app::import_history(db, quality, dir.file("long.csv"), "long.csv"),
                    Catch::Contains("already imported"));
  CHECK(count("SELECT count(*) FROM audit_log") == trail);
}
