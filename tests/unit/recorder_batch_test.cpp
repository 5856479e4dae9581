// The Recorder's batch writing: several prepared groups written at once, each table's rows together. Groups
// whose tables differ (a run without a weight link beside one with) fall back to one group at a time; either
// way every row lands as given, ids as prepared, and the trail verifies.
#include <SQLiteCpp/Transaction.h>

#include <catch2/catch.hpp>

#include "app/registry/weights.hpp"
#include "app/registry/balances.hpp"
#include "app/registry/lab.hpp"
#include "store/audit_trail.hpp"
#include "store/repository.hpp"
#include "support/run_plumb.hpp"
#include "support/registry_inputs.hpp"

using namespace plumb;

namespace {

store::RunRecord run_of(const std::string& on, bool with_weight, std::int64_t calibration_id) {
  store::RunRecord run;
  run.instrument_id = "BAL-1";
  run.procedure = plumb::checks::Procedure::repeatability;
  run.performed_on = parse_date(on);
  run.operator_name = "A. Technician";
  run.results_text = R"({"n":2})";
  run.verdict = Verdict::pass;
  if (with_weight) run.weights.push_back({"W1", calibration_id});
  int seq = 1;
  for (const char* text : {"100.0001", "100.0002"})
    run.readings.push_back({seq++, "", MassReading{text, MassUnit::g, Decimal::parse(text)}});
  return run;
}

}  // namespace

TEST_CASE("groups written together land as prepared, whether their tables match or not", "[audit][recorder]") {
  test::ScratchDir dir;
  store::Database db(dir.file("lab.db"), store::Database::Open::create);
  const store::Actor quality{"Q. Manager", "tester"};
  app::init_lab(db, quality, "Batch Lab");
  const std::int64_t calibration =
      app::add_weight(db, quality, test::e2_weight("W1", "100g", "C-1", "2026-01-10", "2027-01-10")).current.id;
  app::add_balance(db, quality, test::usp41_balance("BAL-1", "7d", "2026-01-15"));

  std::vector<std::int64_t> ids;
  {
    SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
    store::Recorder rec(db.sql(), quality);
    rec.begin_batch({"check_runs", "run_weights", "readings"});
    std::vector<store::PreparedGroup> same, mixed;
    for (const char* on : {"2026-02-02", "2026-02-09", "2026-02-16"}) {
      std::int64_t id = 0;
      same.push_back(store::prepare_run(rec, run_of(on, true, calibration), id));
      ids.push_back(id);
    }
    for (const bool weight : {true, false, true}) {  // the middle run has no weight link: other tables
      std::int64_t id = 0;
      mixed.push_back(store::prepare_run(rec, run_of("2026-03-02", weight, calibration), id));
      ids.push_back(id);
    }
    rec.write(same);
    rec.write(mixed);
    rec.end_batch();
    rec.commit(tx);  // signed like every command
  }
  const auto count = [&](const std::string& sql) { return db.sql().execAndGet(sql).getInt64(); };
  CHECK(count("SELECT count(*) FROM check_runs") == 6);
  CHECK(count("SELECT count(*) FROM run_weights") == 5);
  CHECK(count("SELECT count(*) FROM readings") == 12);
  // The ids prepared are the ids stored, one after the other.
  for (std::size_t k = 0; k < ids.size(); ++k) {
    INFO(k);
    CHECK(ids[k] == ids[0] + static_cast<std::int64_t>(k));
    CHECK(count("SELECT count(*) FROM readings WHERE run_id = " + std::to_string(ids[k])) == 2);
  }
  CHECK(count("SELECT count(*) FROM run_weights WHERE run_id = " + std::to_string(ids[4])) == 0);
  const auto v = store::verify_audit_trail(db.sql());
  INFO((v.problems.empty() ? "" : v.problems.front().message));
  CHECK(v.ok());
}

TEST_CASE("the Recorder refuses a text that is not plain text on one line, for any column", "[audit][recorder]") {
  // The app checks each field by name first (app/registry/fields.hpp); this is the guard behind it for a field a
  // new use case forgets: a run whose operator holds a line break is refused and nothing is written.
  test::ScratchDir dir;
  store::Database db(dir.file("lab.db"), store::Database::Open::create);
  const store::Actor quality{"Q. Manager", "tester"};
  app::init_lab(db, quality, "Batch Lab");
  const std::int64_t calibration =
      app::add_weight(db, quality, test::e2_weight("W1", "100g", "C-1", "2026-01-10", "2027-01-10")).current.id;
  app::add_balance(db, quality, test::usp41_balance("BAL-1", "7d", "2026-01-15"));
  const auto records_before = db.sql().execAndGet("SELECT count(*) FROM audit_log").getInt64();
  auto run = run_of("2026-02-02", true, calibration);
  run.operator_name = "A. Technician\n#99 forged";
  {
    SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
    store::Recorder rec(db.sql(), quality);
    CHECK_THROWS_WITH(store::add_run(rec, run, {}),
                      Catch::Contains("for check_runs.operator holds a line break (U+000A)"));
  }
  CHECK(db.sql().execAndGet("SELECT count(*) FROM check_runs").getInt64() == 0);
  CHECK(db.sql().execAndGet("SELECT count(*) FROM audit_log").getInt64() == records_before);
  // The person recorded in the trail is held to the same rule.
  CHECK_THROWS_WITH(store::Recorder(db.sql(), store::Actor{"Q.\x1B[2JManager", "tester"}),
                    Catch::StartsWith("the user's printed name \"Q.\\x1B[2JManager\" holds an escape character"));
}
