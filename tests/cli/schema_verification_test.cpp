// The schema is part of what `audit verify` proves: what the sqlite3 shell drops or adds (a trigger, a column, a
// table) is named, even when no row changes. The expected schema is what plumb's own migrations create.
#include <catch2/catch.hpp>

#include "support/run_plumb.hpp"

using plumb::test::run_plumb;

namespace {

int sqlite3_shell(const std::string& db, const std::string& sql) {
  return std::system(("sqlite3 '" + db + "' \"" + sql + "\" >/dev/null 2>&1").c_str());
}

plumb::test::RunResult verify_all(const std::string& db, const plumb::test::ScratchDir& dir) {
  return run_plumb({"--db", db, "audit", "verify", "--all"}, dir.path());
}

}  // namespace

TEST_CASE("schema: a dropped append-only trigger is named", "[cli][audit][schema][attack]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  REQUIRE(verify_all(db, dir).status == 0);
  REQUIRE(sqlite3_shell(db, "DROP TRIGGER weights_no_update;") == 0);
  const auto r = verify_all(db, dir);
  CHECK(r.status == 1);
  CHECK_THAT(r.err, Catch::Contains("trigger weights_no_update (on table weights) is missing: it was dropped"));
}

TEST_CASE("schema: every append-only trigger dropped is named, each of them", "[cli][audit][schema][attack]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  REQUIRE(sqlite3_shell(db, "DROP TRIGGER checkpoints_no_delete; DROP TRIGGER lab_no_update;") == 0);
  const auto r = verify_all(db, dir);
  CHECK(r.status == 1);
  CHECK_THAT(r.out, Catch::Contains("trigger checkpoints_no_delete (on table checkpoints) is missing") &&
                        Catch::Contains("trigger lab_no_update (on table lab) is missing"));
}

TEST_CASE("schema: an added column is named", "[cli][audit][schema][attack]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  REQUIRE(sqlite3_shell(db, "ALTER TABLE instruments ADD COLUMN note TEXT;") == 0);
  const auto r = verify_all(db, dir);
  CHECK(r.status == 1);
  CHECK_THAT(r.err, Catch::Contains("column instruments.note (TEXT) is not created by plumb's migrations"));
}

TEST_CASE("schema: an added trigger and an added table are named", "[cli][audit][schema][attack]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  REQUIRE(sqlite3_shell(db,
                        "CREATE TABLE notes (id INTEGER PRIMARY KEY, text TEXT); CREATE TRIGGER quiet AFTER "
                        "INSERT ON weights BEGIN SELECT 1; END;") == 0);
  const auto r = verify_all(db, dir);
  CHECK(r.status == 1);
  CHECK_THAT(r.out, Catch::Contains("table notes is not created by plumb's migrations") &&
                        Catch::Contains("trigger quiet (on table weights) is not created by plumb's migrations"));
}

TEST_CASE("schema: a trigger replaced by one that does nothing is named", "[cli][audit][schema][attack]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  REQUIRE(sqlite3_shell(db,
                        "DROP TRIGGER weights_no_delete; CREATE TRIGGER weights_no_delete BEFORE DELETE ON "
                        "weights BEGIN SELECT 1; END;") == 0);
  const auto r = verify_all(db, dir);
  CHECK(r.status == 1);
  CHECK_THAT(r.err, Catch::Contains("trigger weights_no_delete (on table weights) differs from what plumb's "
                                    "migrations create"));
}
