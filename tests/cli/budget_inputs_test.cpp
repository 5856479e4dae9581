// What a lab enters for the uncertainty budgets beyond the readings, through the built binary: a reference
// weight's density (or density class) and drift allowance (`weight set-properties`, kept as history), the
// thermometer, barometer and hygrometer uncertainties of a calibration, and the balance calibration that stands
// for the balance in a pipette budget. The expected numbers are worked by hand in the comments.
#include <catch2/catch.hpp>

#include <cmath>
#include <nlohmann/json.hpp>

#include "support/margin.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::calibration_lab;
using plumb::test::calibration_run_file;
using plumb::test::grams_near;
using plumb::test::run_plumb;
using plumb::test::ug;

namespace {

json run_json(const plumb::test::ScratchDir& dir, const std::vector<std::string>& args) {
  const auto r = run_plumb(args, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  return json::parse(r.out);
}

const json& line(const json& load, const std::string& source) {
  for (const auto& l : load["budget"]["lines"])
    if (l["source"] == source) return l;
  FAIL("no budget line " << source);
  return load;
}

}  // namespace

TEST_CASE("weight density, density class and drift allowance: entered, kept as history, used in the cg-18 budget",
          "[cli][calibration][weights]") {
  plumb::test::ScratchDir dir;
  const auto db = calibration_lab(dir).string();

  // Nothing entered: the weight's own class. OIML R 111-1:2004 Table 5, E2 >= 100 g: 7810 to 8210 kg/m3 (from
  // memory); 8000 kg/m3 with u = 210 / sqrt 3 = 121.2435565 kg/m3.
  json w = run_json(dir, {"--db", db, "weight", "show", "W100", "--format", "json"});
  CHECK(w["density_kg_m3"].get<double>() == 8000.0);
  CHECK(w["u_density_kg_m3"].get<double>() == Approx(121.2435565).margin(1e-6).epsilon(0));
  CHECK_THAT(w["density_source"].get<std::string>(),
             Catch::Contains("OIML R 111-1:2004 Table 5, class E2") && Catch::Contains("no density entered"));
  CHECK(w["properties"].empty());

  auto r = run_plumb({"--db", db, "weight", "set-properties", "W100", "--density", "7950kg/m3", "--density-u", "5kg/m3",
                      "--drift", "0.02mg", "--as", "Q. Manager"},
                     dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("density 7950 kg/m3, u 5 kg/m3") && Catch::Contains("drift allowance 0.02 mg"));
  w = run_json(dir, {"--db", db, "weight", "show", "W100", "--format", "json"});
  CHECK(w["density_kg_m3"].get<double>() == 7950.0);
  CHECK(w["u_density_kg_m3"].get<double>() == 5.0);
  CHECK_THAT(w["density_source"].get<std::string>(), Catch::Contains("entered") && Catch::Contains("Q. Manager"));
  CHECK(w["drift_allowance_g"] == "0.00002");

  // The class instead of the density; the drift allowance stays. E1 >= 100 g: 7934 to 8067 kg/m3 (from memory),
  // u = 67 / sqrt 3 = 38.6824680 kg/m3. The earlier statement stays in the history.
  r = run_plumb({"--db", db, "weight", "set-properties", "W100", "--density-class", "E1", "--as", "Q. Manager"},
                dir.path());
  REQUIRE(r.status == 0);
  w = run_json(dir, {"--db", db, "weight", "show", "W100", "--format", "json"});
  CHECK(w["density_kg_m3"].get<double>() == 8000.0);
  CHECK(w["u_density_kg_m3"].get<double>() == Approx(38.6824680).margin(1e-6).epsilon(0));
  CHECK(w["drift_allowance_g"] == "0.00002");
  REQUIRE(w["properties"].size() == 2);
  CHECK(w["properties"][0]["density_kg_m3"] == "7950");
  CHECK(w["properties"][1]["density_class"] == "E1");
  CHECK(w["properties"][1]["by"] == "Q. Manager");
  r = run_plumb({"--db", db, "weight", "show", "W100"}, dir.path());
  CHECK_THAT(r.out, Catch::Contains("Density and drift statements") && Catch::Contains("Drift allowance D: 0.02 mg"));

  // A calibration with the thermometer, barometer and hygrometer uncertainties entered (CIPM-2007).
  dir.write("cal.csv", calibration_run_file());
  r = run_plumb({"--db",         db,
                 "check",        "record",
                 "BAL-C",        "--procedure",
                 "calibration",  "--readings",
                 "cal.csv",      "--temperature",
                 "20C",          "--pressure",
                 "1013.25hPa",   "--humidity",
                 "50%",          "--temperature-u",
                 "0.1C",         "--pressure-u",
                 "0.5hPa",       "--humidity-u",
                 "5%",           "--on",
                 "2026-11-30",   "--as",
                 "A. Technician"},
                dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const json run = run_json(dir, {"--db", db, "check", "show", "LAST", "--format", "json"});
  const json& env = run["environment"];
  // Worked by hand in tests/unit/calibration_buoyancy_drift_test.cpp from the CIPM-2007 formula's partial
  // derivatives: rho_a = 1.1993139 kg/m3, u = 9.0794406e-4 kg/m3.
  CHECK(env["air_density_kg_m3"].get<double>() == Approx(1.1993139).margin(2e-6).epsilon(0));
  CHECK(env["u_air_density_kg_m3"].get<double>() == Approx(9.0794406e-4).margin(5e-9).epsilon(0));
  CHECK(env["instrument_u"]["temperature_c"] == "0.1");
  CHECK(env["instrument_u"]["pressure_hpa"] == "0.5");
  CHECK(env["instrument_u"]["humidity_pct"] == "5");
  CHECK_THAT(env["statement"].get<std::string>(), Catch::Contains("u(t) = 0.1 degC") && Catch::Contains("CIPM-2007"));

  // W100 at load 3: air buoyancy (EURAMET cg-18 v4.0 with the GUM 5.1.2 second-order term), by hand, in g:
  //   rho = 8000: 1/rho - 1/rho_c = 0, so only the u(rho) terms remain, u(rho) = 38.6824680 kg/m3;
  //   100 x |1.1993139 - 1.2| x 38.6824680 / 8000^2 = 4.1469088e-8; 100 x 9.0794406e-4 x 38.6824680 / 8000^2
  //   = 5.4877370e-8; u = sqrt of the sum of squares = 6.8783799e-8 g.
  //   drift: one certificate, the allowance D = 0.02 mg, u = 0.02 / sqrt 3 = 0.011547005 mg.
  const json& w100 = run["as_found"]["loads"][2];
  REQUIRE(w100["combination"] == "W100");
  CHECK_THAT(line(w100, "air buoyancy")["contribution_g"].get<double>(), grams_near(6.8783799349e-8, ug(1e-4)));
  CHECK_THAT(line(w100, "air buoyancy")["note"].get<std::string>(),
             Catch::Contains("OIML R 111-1:2004 Table 5, class E1"));
  CHECK_THAT(line(w100, "weight drift")["contribution_g"].get<double>(), grams_near(1.1547005384e-5, ug(1e-4)));
  CHECK_THAT(line(w100, "weight drift")["note"].get<std::string>(), Catch::Contains("drift allowance entered"));
  // W20 has neither an earlier certificate nor an allowance: its row says so.
  CHECK(line(run["as_found"]["loads"][0], "weight drift")["contribution_g"].get<double>() == 0.0);
  CHECK_THAT(line(run["as_found"]["loads"][0], "weight drift")["note"].get<std::string>(),
             Catch::Contains("no drift allowance entered"));
  bool traced = false;
  for (const auto& t : run["weights_used"])
    if (t["id"] == "W100") {
      traced = true;
      CHECK_THAT(t["density_source"].get<std::string>(), Catch::Contains("class E1"));
      CHECK_THAT(t["drift_basis"].get<std::string>(), Catch::Contains("drift allowance entered"));
    }
  CHECK(traced);
  r = run_plumb({"--db", db, "check", "show", "LAST"}, dir.path());
  CHECK_THAT(r.out, Catch::Contains("air buoyancy: EURAMET cg-18 v4.0"));

  // A correction keeps the entered instrument uncertainties unless corrected.
  r = run_plumb({"--db", db, "check", "correct", "LAST", "--humidity", "51%", "--reason", "humidity misread", "--as",
                 "Q. Manager", "--format", "json"},
                dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const json corrected = json::parse(r.out)["correction"];
  CHECK(corrected["environment"]["instrument_u"]["temperature_c"] == "0.1");
  CHECK(corrected["environment"]["instrument_u"]["humidity_pct"] == "5");
}

TEST_CASE("pipette budget: the balance's latest calibration stands for the balance, or the row says there is none",
          "[cli][pipette][calibration]") {
  plumb::test::ScratchDir dir;
  const auto db = calibration_lab(dir).string();
  // A weekly check first (the repeatability ISO 8655-6 Table 1 asks for): W100, s about 0.05 mg <= 0.2 mg.
  dir.write("weekly.csv",
            "reading\n100.0003\n100.0004\n100.0003\n100.0004\n100.0003\n100.0004\n100.0003\n100.0004\n"
            "100.0003\n100.0004\n");
  auto r = run_plumb({"--db", db, "check", "record", "BAL-C", "--weight", "W100", "--readings", "weekly.csv", "--on",
                      "2026-11-27", "--as", "A. Technician"},
                     dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  r = run_plumb({"--db", db, "pipette", "add", "PV-1", "--nominal", "1000uL", "--range", "fixed", "--every", "3mo",
                 "--since", "2026-06-01", "--as", "Q. Manager"},
                dir.path());
  REQUIRE(r.status == 0);
  std::string weighings = "volume,channel,reading\n";
  for (const char* m :
       {"0.9972", "0.9974", "0.9973", "0.9975", "0.9972", "0.9974", "0.9973", "0.9975", "0.9973", "0.9974"})
    weighings += std::string("1000uL,1,") + m + "\n";
  dir.write("w.csv", weighings);
  const std::vector<std::string> pipette_run = {
      "--db",      db,           "check",        "record", "PV-1",         "--procedure", "gravimetric",
      "--balance", "BAL-C",      "--water-temp", "20C",    "--pressure",   "1013hPa",     "--humidity",
      "50%",       "--readings", "w.csv",        "--as",   "A. Technician"};

  // Before any calibration of BAL-C: the readability line stands for the balance, and says why.
  auto args = pipette_run;
  args.insert(args.end(), {"--on", "2026-11-28"});
  r = run_plumb(args, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  json before = run_json(dir, {"--db", db, "check", "show", "LAST", "--format", "json"});
  const json& budget0 = before["volumes"][0]["channels"][0]["uncertainty"]["budget"];
  bool fallback = false;
  for (const auto& l : budget0) {
    CHECK_THAT(l["source"].get<std::string>(), !Catch::Contains("balance calibration"));
    if (l["source"] == "balance readability d") {
      fallback = true;
      CHECK_THAT(l["note"].get<std::string>(), Catch::Contains("no calibration of balance BAL-C recorded on or before "
                                                               "2026-11-28") &&
                                                   Catch::Contains("fallback"));
    }
  }
  CHECK(fallback);
  CHECK(before["balance"]["calibration_run"].is_null());

  // After the calibration: U(E) at its smallest load (20 g, above the 1 g weighed) stands for the balance.
  dir.write("cal.csv", calibration_run_file());
  r = run_plumb({"--db", db, "check", "record", "BAL-C", "--procedure", "calibration", "--readings", "cal.csv", "--on",
                 "2026-11-30", "--as", "A. Technician"},
                dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const json cal = run_json(dir, {"--db", db, "check", "show", "LAST", "--format", "json"});
  const json& w20 = cal["as_found"]["loads"][0];
  REQUIRE(w20["combination"] == "W20");
  args = pipette_run;
  args.insert(args.end(), {"--on", "2026-12-01"});
  r = run_plumb(args, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const json after = run_json(dir, {"--db", db, "check", "show", "LAST", "--format", "json"});
  CHECK(after["balance"]["calibration_run"] == cal["run_id"]);
  const json& budget = after["volumes"][0]["channels"][0]["uncertainty"]["budget"];
  const double z = after["z"]["z_ul_per_mg"].get<double>();
  bool used = false;
  for (const auto& l : budget) {
    CHECK(l["source"] != "balance readability d");  // u(E) holds the rounding of d (EURAMET cg-18)
    if (l["source"] == "balance calibration, u of a weighing") {
      used = true;
      // u = U(E) / k at 20 g (the run's own stated values), times Z, in uL.
      const double u_mg = w20["U_g"].get<double>() / w20["k"].get<double>() * 1e3;
      CHECK(l["u_ul"].get<double>() == Approx(u_mg * z).margin(1e-9).epsilon(0));
      CHECK_THAT(l["note"].get<std::string>(),
                 Catch::Contains("smallest calibrated load") &&
                     Catch::Contains("calibration run " + std::to_string(cal["run_id"].get<int>())));
    }
  }
  CHECK(used);
}
