// One instrument's audit records found through the trail's index of rows (store/item_trail) are exactly the records
// the documented rule picks when the whole trail is read (app/records/audit.hpp: its own rows, every row naming it,
// its runs and their rows, their certificates and their events, its retire/reinstate events), for every instrument
// of the demo lab (weekly checks, calibrations, pipettes, a correction, a void, certificates and their events), and
// of a lab where one instrument was retired and reinstated.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>
#include <set>

#include "store/audit_trail.hpp"
#include "store/database.hpp"
#include "store/item_trail.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::run_plumb;
using plumb::test::ScratchDir;

namespace {

bool text_is(const json& row, const char* column, const std::string& value) {
  return row.contains(column) && row[column].is_string() && row[column].get<std::string>() == value;
}

bool id_in(const json& row, const char* column, const std::set<std::int64_t>& ids) {
  return row.contains(column) && row[column].is_number_integer() && ids.count(row[column].get<std::int64_t>()) > 0;
}

/// The rule, by reading every record of the trail and every row it describes (the way plumb found them before the
/// index was used): the reference the index must agree with.
std::vector<std::int64_t> by_scanning(SQLite::Database& db, const std::string& id) {
  std::set<std::int64_t> runs, certificates;
  std::vector<std::int64_t> out;
  for (const auto& r : plumb::store::audit_records(db)) {
    bool related = false;
    for (const auto& [table, row] : plumb::store::recorded_rows(r)) {
      if (!((table == "instruments" && text_is(row, "id", id)) || text_is(row, "instrument_id", id) ||
            (text_is(row, "item_kind", "instrument") && text_is(row, "item_id", id)) || id_in(row, "run_id", runs) ||
            id_in(row, "certificate_id", certificates)))
        continue;
      related = true;
      if (table == "check_runs") runs.insert(row["id"].get<std::int64_t>());
      if (table == "certificates") certificates.insert(row["id"].get<std::int64_t>());
    }
    if (related) out.push_back(r.seq);
  }
  return out;
}

std::vector<std::string> instrument_ids(SQLite::Database& db) {
  std::vector<std::string> ids;
  SQLite::Statement q(db, "SELECT id FROM instruments ORDER BY id");
  while (q.executeStep()) ids.push_back(q.getColumn(0).getString());
  return ids;
}

}  // namespace

TEST_CASE("an instrument's audit records by the index are those of a scan of the whole trail (demo lab)", "[audit]") {
  ScratchDir dir;
  REQUIRE(run_plumb({"demo"}, dir.path()).status == 0);
  plumb::store::Database db(dir.file("plumb-demo.db"), plumb::store::Database::Open::existing);
  const auto ids = instrument_ids(db.sql());
  REQUIRE(ids.size() >= 3);  // balances and pipettes
  std::size_t records = 0;
  for (const auto& id : ids) {
    INFO(id);
    const auto expected = by_scanning(db.sql(), id);
    CHECK(plumb::store::instrument_record_seqs(db.sql(), id) == expected);
    records += expected.size();
  }
  // Not an agreement of two empty lists: the demo's instruments have runs, certificates and events.
  CHECK(records > 3 * ids.size());
  CHECK(plumb::store::instrument_record_seqs(db.sql(), "NO-SUCH-ID").empty());
}

TEST_CASE("an instrument's audit records by the index include its retirement and reinstatement", "[audit]") {
  ScratchDir dir;
  const auto path = plumb::test::example_lab(dir);
  const std::string db = path.string();
  REQUIRE(run_plumb({"--db", db, "balance", "add", "BAL-B", "--capacity", "220g", "--readability", "0.1mg", "--every",
                     "7d", "--smallest-net", "200mg", "--location", "Room 3", "--since", "2026-01-05"},
                    dir.path())
              .status == 0);
  dir.write("readings.csv",
            "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n"
            "100.0002\n");
  for (const char* id : {"BAL-A", "BAL-B", "BAL-A"})
    REQUIRE(run_plumb({"--db", db, "check", "record", id, "--weight", "W100", "--readings", "readings.csv", "--on",
                       "2026-11-30"},
                      dir.path())
                .status == 0);
  REQUIRE(run_plumb({"--db", db, "instrument", "retire", "BAL-B", "--reason", "replaced"}, dir.path()).status == 0);
  REQUIRE(run_plumb({"--db", db, "instrument", "reinstate", "BAL-B", "--reason", "needed again"}, dir.path()).status ==
          0);
  plumb::store::Database store(path, plumb::store::Database::Open::existing);
  for (const char* id : {"BAL-A", "BAL-B"}) {
    INFO(id);
    CHECK(plumb::store::instrument_record_seqs(store.sql(), id) == by_scanning(store.sql(), id));
  }
  // BAL-B: registered (its instrument and balance rows, one record or more), one run, retired, reinstated.
  const auto b = plumb::store::instrument_record_seqs(store.sql(), "BAL-B");
  CHECK(b.size() >= 4);
  const auto a = plumb::store::instrument_record_seqs(store.sql(), "BAL-A");
  for (const auto seq : b) CHECK(std::find(a.begin(), a.end(), seq) == a.end());
}
