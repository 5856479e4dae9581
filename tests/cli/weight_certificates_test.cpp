// A reference weight over several calibrations through the built binary: `weight recalibrate` appends a
// certificate, `weight show` lists them all with the one in force, history import traces old runs to the
// certificate in force on their date, and certificates outside the weight's OIML R 111 class are refused unless a
// reason is recorded.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include "support/audit_chain.hpp"
#include "support/margin.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::grams_near;
using plumb::test::run_plumb;
using plumb::test::ug;

namespace {

// Mean 100.00023 g (the readings of the weekly check example; worked in repeatability_test.cpp).
const std::vector<std::string> readings = {"100.0003", "100.0001", "100.0002", "100.0004", "100.0002",
                                           "100.0003", "100.0001", "100.0002", "100.0003", "100.0002"};

/// A lab whose W100 was first calibrated in 2025 (correction +0.10 mg, certificate CAL-25-001).
std::string lab_with_old_certificate(const plumb::test::ScratchDir& dir) {
  const auto db = dir.file("lab.db").string();
  const std::vector<std::vector<std::string>> steps = {
      {"--db", db, "init", "--lab", "Alder Creek Test Lab"},
      {"--db", db, "balance", "add", "BAL-A", "--capacity", "220g", "--readability", "0.1mg", "--every", "7d",
       "--smallest-net", "200mg", "--since", "2025-01-06"},
      {"--db", db, "weight", "add", "W100", "--nominal", "100g", "--class", "E2", "--correction", "0.10mg",
       "--uncertainty", "0.05mg", "--certificate", "CAL-25-001", "--calibrated", "2025-01-10", "--due", "2026-01-10"}};
  for (const auto& s : steps) {
    const auto r = run_plumb(s, dir.path());
    INFO(r.err);
    REQUIRE(r.status == 0);
  }
  return db;
}

std::vector<std::string> recalibrate(const std::string& db, const std::string& certificate, const std::string& on,
                                     const std::string& due, const std::string& correction,
                                     const std::string& u = "0.04mg") {
  return {"--db",      db,      "weight", "recalibrate",  "W100",     "--certificate", certificate, "--calibrated",
          on,          "--due", due,      "--correction", correction, "--uncertainty", u,           "--as",
          "Q. Manager"};
}

}  // namespace

TEST_CASE("a recalibrated weight keeps every certificate, each in force for its own dates", "[cli][weights]") {
  plumb::test::ScratchDir dir;
  const auto db = lab_with_old_certificate(dir);

  // Overdue since 2026-01-10: shown as such, and a check dated after the due date is refused.
  auto r = run_plumb({"--db", db, "weight", "show", "W100", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK(json::parse(r.out)["status"] == "overdue");
  r = run_plumb({"--db", db, "weight", "list", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK(json::parse(r.out)[0]["status"] == "overdue");
  std::string csv = "reading\n";
  for (const auto& x : readings) csv += x + "\n";
  dir.write("r.csv", csv);
  r = run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on",
                 "2026-02-02", "--as", "A. Technician"},
                dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("overdue"));

  // The new certificate (calibrated 2026-01-20, correction -0.05 mg), due far ahead so the test stays in date.
  r = run_plumb(recalibrate(db, "CAL-26-014", "2026-01-20", "2099-01-20", "-0.05mg"), dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("Weight W100 recalibrated: certificate CAL-26-014") &&
                        Catch::Contains("conventional mass 99.99995 g") && Catch::Contains("in force today"));

  // Now a check after the recalibration is traced to the new certificate: bias = 100.00023 - 99.99995 g
  // = 0.00028 g (by hand).
  r = run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on",
                 "2026-02-02", "--as", "A. Technician", "--format", "json"},
                dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  r = run_plumb({"--db", db, "check", "show", "1", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(json::parse(r.out)["bias_g"].get<double>(), grams_near(0.00028, ug(1e-6)));

  // weight show: both certificates, oldest first, the new one in force.
  r = run_plumb({"--db", db, "weight", "show", "W100", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json shown = json::parse(r.out);
  CHECK(shown["status"] == "in date");
  CHECK(shown["class"] == "E2");
  CHECK(shown["in_force_certificate"] == "CAL-26-014");
  REQUIRE(shown["certificates"].size() == 2);
  CHECK(shown["certificates"][0]["certificate"] == "CAL-25-001");
  CHECK(shown["certificates"][0]["in_force"] == false);
  CHECK(shown["certificates"][0]["calibrated_on"] == "2025-01-10");
  CHECK(shown["certificates"][0]["due_on"] == "2026-01-10");
  CHECK_THAT(shown["certificates"][0]["conventional_mass_g"].get<double>(), grams_near(100.0001, ug(1e-6)));
  CHECK(shown["certificates"][1]["certificate"] == "CAL-26-014");
  CHECK(shown["certificates"][1]["in_force"] == true);
  CHECK(shown["certificates"][1]["correction_mg"].get<double>() == Approx(-0.05).margin(1e-12).epsilon(0));
  CHECK(shown["certificates"][1]["uncertainty_mg"].get<double>() == Approx(0.04).margin(1e-12).epsilon(0));
  CHECK(shown["certificates"][1]["k"].get<double>() == Approx(2).margin(1e-12).epsilon(0));
  CHECK(shown["certificates"][1]["class_override"].is_null());
  r = run_plumb({"--db", db, "weight", "show", "W100"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("Weight W100: nominal 100g, OIML R 111-1:2004 class E2") &&
                        Catch::Contains("certificate CAL-26-014 in force") && Catch::Contains("CAL-25-001") &&
                        Catch::Contains("100.0001") && Catch::Contains("99.99995"));

  // The same certificate number twice is refused; so is an unknown weight.
  r = run_plumb(recalibrate(db, "CAL-26-014", "2026-02-20", "2099-02-20", "0mg"), dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("CAL-26-014 is already recorded for weight W100"));
  r = run_plumb({"--db", db, "weight", "show", "W999"}, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("W999"));
  // Retired: marked so by show and list, whatever its certificates say.
  r = run_plumb({"--db", db, "weight", "list"}, dir.path());
  CHECK_THAT(r.out, Catch::Contains("in date"));
  REQUIRE(run_plumb({"--db", db, "weight", "retire", "W100", "--reason", "chipped", "--as", "Q. Manager"}, dir.path())
              .status == 0);
  r = run_plumb({"--db", db, "weight", "show", "W100"}, dir.path());
  CHECK_THAT(r.out, Catch::Contains("retired") && Catch::Contains("by Q. Manager: chipped"));
  r = run_plumb({"--db", db, "weight", "list", "--format", "json"}, dir.path());
  CHECK(json::parse(r.out)[0]["status"] == "retired");
  CHECK(plumb::test::check_audit_chain(db).problem.empty());
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);
}

TEST_CASE("history import traces a run dated before the current certificate to the earlier one",
          "[cli][weights][import]") {
  plumb::test::ScratchDir dir;
  const auto db = lab_with_old_certificate(dir);
  REQUIRE(run_plumb(recalibrate(db, "CAL-26-014", "2026-01-20", "2099-01-20", "-0.05mg"), dir.path()).status == 0);
  // One run in 2025 (under CAL-25-001), one in 2026 (under CAL-26-014).
  std::string csv = "instrument,procedure,date,operator,weight,reading,unit\n";
  for (const char* date : {"2025-06-02", "2026-06-01"})
    for (const auto& x : readings)
      csv += std::string("BAL-A,repeatability,") + date + ",A. Technician,W100," + x + ",g\n";
  dir.write("history.csv", csv);
  auto r = run_plumb({"--db", db, "check", "import", "history.csv", "--as", "Q. Manager"}, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  // 2025: conventional mass 100 g + 0.10 mg = 100.0001 g, bias 100.00023 - 100.0001 = 0.00013 g (by hand).
  r = run_plumb({"--db", db, "check", "show", "1", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK(json::parse(r.out)["date"] == "2025-06-02");
  CHECK_THAT(json::parse(r.out)["bias_g"].get<double>(), grams_near(0.00013, ug(1e-6)));
  // 2026: conventional mass 99.99995 g, bias 0.00028 g.
  r = run_plumb({"--db", db, "check", "show", "2", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(json::parse(r.out)["bias_g"].get<double>(), grams_near(0.00028, ug(1e-6)));
  // The stored trace names each run's own certificate.
  r = run_plumb({"--db", db, "certificate", "issue", "1", "--as", "Q. Manager", "--format", "json"}, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("CAL-25-001"));
}

TEST_CASE("a certificate outside its R 111 class is refused unless the lab records why it accepts it",
          "[cli][weights][r111]") {
  plumb::test::ScratchDir dir;
  const auto db = lab_with_old_certificate(dir);
  plumb::test::prepare_login(recalibrate(db, "CAL-26-015", "2026-01-20", "2099-01-20", "0.2mg"), dir.path());
  const std::string before = plumb::test::dump_database(db);  // with the member's account: the refusals are compared
  // E2 100 g: MPE 0.16 mg (OIML R 111-1:2004 Table 1, reference-data CSV), so U may be at most 0.0533 mg.
  auto r = run_plumb(recalibrate(db, "CAL-26-015", "2026-01-20", "2099-01-20", "0.2mg"), dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("--correction 0.2mg") && Catch::Contains("class E2 at 100 g") &&
                        Catch::Contains("0.16 mg") && Catch::Contains("OIML R 111-1:2004"));
  r = run_plumb(recalibrate(db, "CAL-26-015", "2026-01-20", "2099-01-20", "0.1mg", "0.06mg"), dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("--uncertainty 0.06mg") && Catch::Contains("more than a third"));
  CHECK(plumb::test::dump_database(db) == before);

  // Accepted with a reason: recorded, shown, and in the audit trail.
  auto args = recalibrate(db, "CAL-26-015", "2026-01-20", "2099-01-20", "0.2mg");
  args.insert(args.end(), {"--override-reason", "supplier re-issue pending; used for coarse checks only"});
  r = run_plumb(args, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("accepted outside class E2 (correction)"));
  r = run_plumb({"--db", db, "weight", "show", "W100", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json o = json::parse(r.out)["certificates"][1]["class_override"];
  REQUIRE(o.is_object());
  CHECK(o["beyond"] == "correction");
  CHECK(o["class"] == "E2");
  CHECK(o["mpe_mg"].get<double>() == Approx(0.16).margin(1e-12).epsilon(0));
  CHECK(o["reason"] == "supplier re-issue pending; used for coarse checks only");
  CHECK(o["by"] == "Q. Manager");
  r = run_plumb({"--db", db, "weight", "show", "W100"}, dir.path());
  CHECK_THAT(r.out, Catch::Contains("class override") &&
                        Catch::Contains("supplier re-issue pending; used for coarse checks only"));
  r = run_plumb({"--db", db, "audit", "log", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("weight_class_overrides"));
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);

  // The overrides table refuses an edit behind plumb's back (append-only trigger).
  CHECK(std::system(
            ("sqlite3 '" + db + "' \"UPDATE weight_class_overrides SET reason = 'x'\" >/dev/null 2>&1").c_str()) != 0);
  // weight add checks the class too, and accepts with a reason.
  r = run_plumb(
      {"--db", db, "weight", "add", "W50", "--nominal", "50g", "--class", "E2", "--correction", "0.3mg",
       "--uncertainty", "0.03mg", "--certificate", "C-50", "--calibrated", "2026-01-10", "--due", "2099-01-10"},
      dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err,
             Catch::Contains("--correction 0.3mg") && Catch::Contains("class E2 at 50 g") && Catch::Contains("0.1 mg"));
  // F1 50 g: MPE 0.3 mg (Table 1), the same certificate is within.
  r = run_plumb(
      {"--db", db, "weight", "add", "W50", "--nominal", "50g", "--class", "F1", "--correction", "0.3mg",
       "--uncertainty", "0.03mg", "--certificate", "C-50", "--calibrated", "2026-01-10", "--due", "2099-01-10"},
      dir.path());
  INFO(r.err);
  CHECK(r.status == 0);
}
