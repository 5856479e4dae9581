// Which weekly check of a balance is evidence of its repeatability for a pipette check (ISO 8655-6 Table 1):
// the latest that counts (not corrected, not void) and met its own minimum of readings. A short run from
// before the minimum was enforced (3 readings judged under USP <41>, which asks for not less than 10) and a
// void run are passed over. Such records cannot be made through the app any more, so the test writes them
// with the store, as an older plumb did.
#include <SQLiteCpp/Transaction.h>

#include <catch2/catch.hpp>

#include "app/pipette/record.hpp"
#include "app/pipette/registry.hpp"
#include "app/registry/balances.hpp"
#include "app/registry/lab.hpp"
#include "app/registry/weights.hpp"
#include "app/weekly_check/record.hpp"
#include "checks/repeatability.hpp"
#include "core/errors.hpp"
#include "store/repository.hpp"
#include "store/status_events.hpp"
#include "support/margin.hpp"
#include "support/registry_inputs.hpp"
#include "support/run_plumb.hpp"

using namespace plumb;
using plumb::test::grams_near;
using plumb::test::ug;

namespace {

const store::Actor quality{"Q. Manager", "tester"};

// SM-02's readings of W100 from tests/cli/pipette_check_test.cpp: s = sqrt(0.00076 / 9) mg = 0.009189365835 mg by
// hand, within the 0.02 mg ISO 8655-6 Table 1 asks for at 10 uL < V <= 100 uL (from memory).
const char* ten_readings =
    "reading\n100.00003\n100.00004\n100.00002\n100.00003\n100.00005\n100.00003\n100.00002\n100.00004\n100.00003\n"
    "100.00003\n";

// The weighings of the pipette worked example (tests/unit/pipette_check_test.cpp), 100 uL, channel 1.
std::string weighings() {
  std::string csv = "volume,channel,reading\n";
  for (const char* r :
       {"0.09971", "0.09965", "0.09980", "0.09958", "0.09992", "0.09975", "0.09969", "0.09983", "0.09961", "0.09977"})
    csv += std::string("100uL,1,") + r + "\n";
  return csv;
}

app::PipetteCheckInput pipette_run(const std::string& on) {
  app::PipetteCheckInput in;
  in.pipette_id = "P-07";
  in.balance_id = "SM-02";
  in.water_temperature = "20C";
  in.pressure = "1013hPa";
  in.humidity = "50%";
  in.readings_csv = weighings();
  in.readings_source = "w.csv";
  in.on = on;
  in.operator_name = "A. Technician";
  return in;
}

/// A copy of `full` three readings long and dated `on`, stored as a plumb without the minimum stored it: no
/// required_readings, n = 3, and a repeatability s of 0.05 mg that ISO 8655-6 would refuse.
std::int64_t add_short_legacy_run(store::Database& db, const store::RunRecord& full, const std::string& on) {
  store::RunRecord run = full;
  run.id = 0;
  run.performed_on = parse_date(on);
  run.next_due = add_interval(run.performed_on, Interval::parse("7d", "every"));
  run.readings.resize(3);
  run.results.erase("required_readings");
  run.results.erase("readings_basis");
  run.results["n"] = 3;
  run.results["sd_g"] = 0.00005;
  SQLite::Transaction tx(db.sql());
  store::Recorder rec(db.sql(), quality);
  const std::int64_t id = store::add_run(rec, run);
  rec.commit(tx);  // signed like every command
  return id;
}

}  // namespace

TEST_CASE("met_its_minimum: a run is evidence only with the readings its policy asked for",
          "[repeatability][min-readings]") {
  CHECK(checks::met_its_minimum(10, 10));
  CHECK_FALSE(checks::met_its_minimum(9, 10));
  CHECK(checks::met_its_minimum(3, 3));  // a lab policy of 3
  // Recorded before the minimum was stored: 10, what USP <41> and a lab policy without its own minimum asked.
  CHECK_FALSE(checks::met_its_minimum(3, std::nullopt));
  CHECK(checks::met_its_minimum(10, std::nullopt));
  // Never below the two readings an SD needs.
  CHECK_FALSE(checks::met_its_minimum(1, 1));
}

TEST_CASE("a pipette check takes the balance's repeatability from its latest full, current run",
          "[pipette][min-readings]") {
  test::ScratchDir dir;
  store::Database db(dir.file("lab.db"), store::Database::Open::create);
  app::init_lab(db, quality, "Evidence Lab");
  app::add_weight(db, quality, test::e2_weight("W100", "100g", "RC-2291", "2026-03-02", "2027-03-02"));
  app::BalanceInput b = test::usp41_balance("SM-02", "7d", "2026-01-05");
  b.capacity = "120g";
  b.readability = "0.01mg";
  b.smallest_net = "50mg";
  app::add_balance(db, quality, b);
  app::PipetteInput p;
  p.id = "P-07";
  p.nominal = "100uL";
  p.range = "fixed";
  p.every = "3mo";
  p.since = "2026-06-01";
  app::add_pipette(db, quality, p);

  app::CheckInput check;
  check.instrument_id = "SM-02";
  check.weight_ids = {"W100"};
  check.readings_csv = ten_readings;
  check.readings_source = "sm02.csv";
  check.on = "2026-11-23";
  check.operator_name = "A. Technician";
  const store::RunRecord full = app::record_check(db, quality, check);
  REQUIRE(full.results["required_readings"] == 10);
  const std::int64_t short_run = add_short_legacy_run(db, full, "2026-11-30");

  // The short run is the latest (in date, passing) but 3 readings are fewer than it was judged to need: the
  // repeatability comes from the full run of 2026-11-23.
  const store::RunRecord pipette = app::record_pipette_check(db, quality, pipette_run("2026-12-01"));
  const auto& used = pipette.results["balance"];
  CHECK(used["latest_check_run"] == short_run);
  CHECK(used["repeatability_run"] == full.id);
  CHECK_THAT(used["repeatability_g"].get<double>(), grams_near(0.000009189365835, ug(1e-6)));

  // With the full run void, nothing on record is evidence of the repeatability: the balance is not suitable and
  // the pipette run is refused.
  {
    SQLite::Transaction tx(db.sql());
    store::Recorder rec(db.sql(), quality);
    store::add_run_void(rec, full.id, "entered against the wrong balance");
    rec.commit(tx);  // signed like every command
  }
  CHECK_THROWS_WITH(app::record_pipette_check(db, quality, pipette_run("2026-12-02")),
                    Catch::Contains("not suitable") && Catch::Contains("no repeatability on record"));
}
