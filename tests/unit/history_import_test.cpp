// The history import in the app layer: a run older than a weight's current certificate is traced to the
// certificate that was valid on its date, and a failed import leaves nothing behind.
#include <SQLiteCpp/Statement.h>
#include <SQLiteCpp/Transaction.h>

#include <catch2/catch.hpp>

#include "app/history_import.hpp"
#include "app/registry.hpp"
#include "core/errors.hpp"
#include "store/repository.hpp"
#include "support/run_plumb.hpp"

using namespace plumb;

namespace {

const store::Actor quality{"Q. Manager", "tester"};

std::string rows(const std::string& date) {
  std::string csv;
  for (const char* r : {"100.0003", "100.0001", "100.0002"})
    csv += std::string("BAL-H,repeatability,") + date + ",A. Technician,W1," + r + ",g\n";
  return csv;
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
  app::init_lab(db, quality, "History Lab");
  app::WeightInput w;
  w.id = "W1";
  w.nominal = "100g";
  w.weight_class = "E2";
  w.uncertainty = "0.05mg";
  w.certificate = "OLD-1";
  w.calibrated = "2024-01-10";
  w.due = "2025-01-10";
  const auto first = app::add_weight(db, quality, w);
  {
    // The weight's recalibration: a second certificate, now the current one.
    SQLite::Transaction tx(db.sql());
    store::Recorder rec(db.sql(), quality);
    store::WeightCalibration c = first.current;
    c.certificate_no = "NEW-2";
    c.calibrated_on = parse_date("2025-02-03");
    c.due_on = parse_date("2026-02-03");
    store::add_weight_calibration(rec, "W1", c);
    tx.commit();
  }
  app::BalanceInput b;
  b.id = "BAL-H";
  b.capacity = "220g";
  b.readability = "0.1mg";
  b.every = "6mo";
  b.smallest_net = "200mg";
  b.since = "2023-12-01";
  app::add_balance(db, quality, b);
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
    CHECK_THAT(e.what(), Catch::Contains("late.csv line 8 (run of BAL-H on 2025-01-20)"));
    CHECK_THAT(e.what(), Catch::Contains("W1 was due for calibration on 2025-01-10"));
  }
  SQLite::Statement count(db.sql(), "SELECT count(*) FROM check_runs");
  REQUIRE(count.executeStep());
  CHECK(count.getColumn(0).getInt() == 2);
}
