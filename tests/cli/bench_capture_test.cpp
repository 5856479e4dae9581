// Guided captures at the bench beyond the weekly check: a pipette's gravimetric check and a balance calibration's
// loads, each against the balance simulator (tests/support/bench_terminals.hpp) and through a real terminal. The
// captured run must be the run `check record` makes from the same readings in a file; what the balance sent is kept
// with it; a capture cut short writes nothing.
#include <catch2/catch.hpp>

#include <fmt/format.h>
#include <signal.h>
#include <unistd.h>

#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "support/bench_terminals.hpp"
#include "support/margin.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::BalanceSimulator;
using plumb::test::microlitres_near;
using plumb::test::percent_near;
using plumb::test::pp;
using plumb::test::run_plumb;
using plumb::test::Terminal;
using plumb::test::ul;

namespace {

/// The keyboard as a pipe: plumb reads its standard input from it while its output goes to its .stdout file, so
/// the test can type a value at the moment the capture asks for it.
class Keyboard {
 public:
  Keyboard() { REQUIRE(::pipe(fds_) == 0); }
  ~Keyboard() {
    for (int& fd : fds_)
      if (fd >= 0) ::close(fd);
  }
  Keyboard(const Keyboard&) = delete;
  Keyboard& operator=(const Keyboard&) = delete;
  [[nodiscard]] int read_end() const { return fds_[0]; }
  /// Once plumb has started, the test keeps only the writing end.
  void started() {
    ::close(fds_[0]);
    fds_[0] = -1;
  }
  void type(const std::string& keys) const {
    REQUIRE(::write(fds_[1], keys.data(), keys.size()) == static_cast<ssize_t>(keys.size()));
  }

 private:
  int fds_[2] = {-1, -1};
};

// SM-02 (d = 0.01 mg) checked on 2026-11-30 with W100, as in tests/cli/pipette_check_test.cpp, and P-07, a fixed
// 100 uL pipette judged by ISO 8655-2:2002 Table 1.
std::string pipette_lab(const plumb::test::ScratchDir& dir) {
  const auto db = plumb::test::pipette_balance_lab(dir).string();
  const auto r = run_plumb({"--db", db, "pipette", "add", "P-07", "--nominal", "100uL", "--range", "fixed", "--every",
                            "3mo", "--location", "Lab 2", "--since", "2026-06-01", "--as", "Q. Manager"},
                           dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  return db;
}

// The ten weighings of the worked example in tests/unit/pipette_check_test.cpp, as SM-02 shows them in g.
const std::vector<std::string> ten = {"0.09971", "0.09965", "0.09980", "0.09958", "0.09992",
                                      "0.09975", "0.09969", "0.09983", "0.09961", "0.09977"};

std::vector<std::string> pipette_args(const std::string& db, const std::string& from) {
  return {"--db",      db,       "check",      "capture", "P-07",       "--procedure", "gravimetric",
          "--balance", "SM-02",  "--pressure", "1013hPa", "--humidity", "50%",         "--replicates",
          "10",        "--from", from,         "--on",    "2026-12-01", "--as",        "A. Technician"};
}

/// The results of the worked example (tests/cli/pipette_check_test.cpp, by hand from Tanaka et al. (2001) water
/// density, OIML R 111-1 Annex E air density, ISO 8655-6 Z and ISO 8655-2:2002 Table 1, the last from memory): at
/// 20 degC, 1013 hPa, 50 %: Z = 1.0028509 uL/mg; mean 99.731 mg -> 100.01532 uL; s = 0.1045041 mg -> 0.1048020 uL;
/// CV 0.10479 %; limits 0.8 uL and 0.3 uL: pass.
void check_worked_pipette_results(const json& j) {
  CHECK(j["procedure"] == "gravimetric");
  CHECK(j["environment"]["water_temperature_c"] == 20.0);
  CHECK(j["z"]["z_ul_per_mg"].get<double>() == Approx(1.0028509).margin(0.00000005).epsilon(0));
  REQUIRE(j["volumes"].size() == 1);
  const json& c = j["volumes"][0]["channels"][0];
  CHECK(c["n"] == 10);
  CHECK_THAT(c["mean_ul"].get<double>(), microlitres_near(100.01532, ul(0.000005)));
  CHECK_THAT(c["random_error_ul"].get<double>(), microlitres_near(0.1048020, ul(0.0000005)));
  CHECK_THAT(c["cv_pct"].get<double>(), percent_near(0.10479, pp(0.000005)));
  CHECK(j["verdict"] == "pass");
}

// The calibration example's plan: the rows of tests/support/run_plumb.cpp's run file, without reading and unit.
std::string plan_of(const std::string& run_file) {
  std::string plan, line;
  std::vector<std::string> readings;
  std::size_t pos = 0;
  while (pos < run_file.size()) {
    const auto end = run_file.find('\n', pos);
    line = run_file.substr(pos, end - pos);
    pos = end + 1;
    // Drop the last two fields (reading, unit).
    const auto unit_comma = line.rfind(',');
    const auto reading_comma = line.rfind(',', unit_comma - 1);
    plan += line.substr(0, reading_comma) + "\n";
  }
  return plan;
}

/// The readings of the run file, in order.
std::vector<std::string> readings_of(const std::string& run_file) {
  std::vector<std::string> out;
  std::size_t pos = run_file.find('\n') + 1;  // after the header
  while (pos < run_file.size()) {
    const auto end = run_file.find('\n', pos);
    const std::string line = run_file.substr(pos, end - pos);
    pos = end + 1;
    const auto unit_comma = line.rfind(',');
    const auto reading_comma = line.rfind(',', unit_comma - 1);
    out.push_back(line.substr(reading_comma + 1, unit_comma - reading_comma - 1));
  }
  return out;
}

std::vector<std::string> calibration_args(const std::string& db, const std::string& from) {
  return {"--db",        db,           "check",      "capture",       "BAL-C",        "--procedure",
          "calibration", "--plan",     "plan.csv",   "--temperature", "20C",          "--pressure",
          "1013.25hPa",  "--humidity", "50%",        "--air-formula", "oiml-r111",    "--from",
          from,          "--on",       "2026-11-30", "--as",          "A. Technician"};
}

/// Two runs' JSON without what only a capture has (its lines) and when each was written.
void check_same_run(json a, json b) {
  for (auto* j : {&a, &b}) {
    j->erase("raw_lines");
    j->erase("recorded_at");
  }
  CHECK(a == b);
}

}  // namespace

TEST_CASE("pipette capture from the balance: temperatures typed, only stable weighings counted, lines kept",
          "[capture][pipette]") {
  plumb::test::ScratchDir dir;
  const auto db = pipette_lab(dir);
  BalanceSimulator balance;
  Keyboard keyboard;
  plumb::test::PlumbProcess plumb(pipette_args(db, balance.device()), dir.path(), "", keyboard.read_end());
  keyboard.started();
  plumb.wait_for_output("Water temperature at the start");
  balance.send("+  0.09971 g\r\n");  // a weighing before the temperature: said, kept, not counted
  plumb.wait_for_output("the water temperature is asked for now");
  keyboard.type("19.8\n");
  plumb.wait_for_output("water temperature at the start of the weighings: 19.8 degC");
  plumb.wait_for_output("Weighing 1 of 10 (100 uL, channel 1, replicate 1 of 10)");
  const auto line = [&](const std::string& bytes, const std::string& said) {
    balance.send(bytes);
    plumb.wait_for_output(said);
  };
  line("?  0.09970 g\r\n", "is marked unstable");
  line(std::string("\x00\xFE garbage\r\n", 11), "is not a reading");
  line("+   99.71 mg\r\n", "is not in g, the unit SM-02 is set to show");
  line("+  0.099712 g\r\n", "shows more decimals than the readability 0.01 mg of balance SM-02 allows.");
  line("+  0.00000 g\r\n", "is not a positive mass.");
  balance.send_split("+  0.09", "971 g\r\n");  // weighing 1, split across two reads
  plumb.wait_for_output("weighing 1 counted: 0.09971 g   n = 1");
  for (std::size_t i = 1; i < ten.size(); ++i)
    line("+  " + ten[i] + " g\r\n", fmt::format("weighing {} counted", i + 1));
  plumb.wait_for_output("Water temperature at the end");
  keyboard.type("20.2\n");
  const auto r = plumb.wait();
  INFO(r.out << r.err);
  REQUIRE(r.status == 0);
  // The mean of 19.8 and 20.2 degC is 20.00 degC exactly (one decimal more than the readings).
  CHECK_THAT(r.out, Catch::Contains("Water temperature of the run: 20.00 degC"));
  CHECK_THAT(r.out, Catch::Contains("PASS"));
  const json j = json::parse(run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path()).out);
  check_worked_pipette_results(j);
  for (std::size_t i = 0; i < ten.size(); ++i) CHECK(j["readings"][i]["text"] == ten[i]);
  const json& lines = j["raw_lines"];
  // 1 early weighing, the start temperature, 5 refused or unreadable lines, 10 weighings, the end temperature.
  REQUIRE(lines.size() == 18);
  CHECK(lines[0]["outcome"] == "not a reading");
  CHECK(lines[1]["source"] == "typed");
  CHECK(lines[1]["line"] == "19.8");
  CHECK(lines[2]["outcome"] == "unstable");
  CHECK(lines[3]["line"] == "\\x00\\xFE garbage");
  CHECK(lines[7]["line"] == "+  0.09971 g");  // joined from its two pieces
  CHECK(lines[7]["reading"] == 1);
  CHECK(lines[16]["reading"] == 10);
  CHECK(lines[17]["line"] == "20.2");
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);
}

TEST_CASE("a captured pipette check is the run check record makes from the same weighings", "[capture][pipette]") {
  plumb::test::ScratchDir captured, recorded;
  const auto db_c = pipette_lab(captured);
  const auto db_r = pipette_lab(recorded);
  // Typed at the prompt this time: temperatures, then the weighings, from one input.
  std::string keys = "19.8\n";
  for (const auto& w : ten) keys += w + "\n";
  keys += "20.2\n";
  const auto c = run_plumb(pipette_args(db_c, "typed"), captured.path(), keys);
  INFO(c.out << c.err);
  REQUIRE(c.status == 0);
  std::string csv = "volume,channel,reading\n";
  for (const auto& w : ten) csv += "100uL,1," + w + "\n";
  recorded.write("w.csv", csv);
  const auto r =
      run_plumb({"--db",      db_r,         "check",        "record", "P-07",       "--procedure", "gravimetric",
                 "--balance", "SM-02",      "--water-temp", "20.00C", "--pressure", "1013hPa",     "--humidity",
                 "50%",       "--readings", "w.csv",        "--on",   "2026-12-01", "--as",        "A. Technician"},
                recorded.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const json a =
      json::parse(run_plumb({"--db", db_c, "check", "show", "LAST", "--format", "json"}, captured.path()).out);
  const json b =
      json::parse(run_plumb({"--db", db_r, "check", "show", "LAST", "--format", "json"}, recorded.path()).out);
  check_worked_pipette_results(a);
  CHECK(a["raw_lines"].size() == 12);
  check_same_run(a, b);
}

TEST_CASE("pipette capture: the evaporation blank, refusals of typed values, the edition's replicates",
          "[capture][pipette]") {
  plumb::test::ScratchDir dir;
  const auto db = pipette_lab(dir);
  // ISO 8655:2002 in plumb: at least 4 replicates (checks/pipette_edition); fewer is refused before any reading.
  auto args = pipette_args(db, "typed");
  args[14] = "3";
  auto r = run_plumb(args, dir.path(), "");
  CHECK(r.status == 2);
  CHECK_THAT(r.err,
             Catch::Contains("--replicates 3: pipette P-07 is checked to ISO 8655:2002, which needs at least 4"));
  // The default is the edition's count: 4 weighings.
  args = pipette_args(db, "typed");
  args.erase(args.begin() + 13, args.begin() + 15);
  args.push_back("--evaporation-blank");
  // A temperature outside ISO 8655-6's range, one with too many decimals, then 20; a blank that gained mass, then
  // the blank -0.00002 g (0.02 mg lost); four weighings; the end temperature 20.
  const std::string keys = "35\n20.0001\n20\n0.00001\n-0.00002\n0.09971\n0.09965\n0.09980\n0.09958\n20\n";
  r = run_plumb(args, dir.path(), keys);
  INFO(r.out << r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("typed line 1: water temperature at the start 35 degC is outside the range of the "
                                    "gravimetric method (ISO 8655-6)"));
  CHECK_THAT(r.out, Catch::Contains("water temperature \"20.0001\" shows more than 3 decimals"));
  CHECK_THAT(r.out, Catch::Contains("evaporation blank \"0.00001\" g shows a gain in mass"));
  CHECK_THAT(r.out, Catch::Contains("evaporation blank: 0.02 mg lost per weighing cycle"));
  const json j = json::parse(run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path()).out);
  CHECK(j["volumes"][0]["channels"][0]["n"] == 4);
  // 0.00002 g as entered, exactly.
  CHECK(j["environment"]["evaporation_g"].get<double>() == Approx(0.00002).margin(1e-12).epsilon(0));
  CHECK(j["raw_lines"].size() == 10);
}

TEST_CASE("a pipette capture cut short writes nothing", "[capture][pipette]") {
  plumb::test::ScratchDir dir;
  const auto db = pipette_lab(dir);
  plumb::test::prepare_login(pipette_args(db, "typed"), dir.path());
  const auto before = plumb::test::dump_database(db);
  SECTION("the cable pulled midway") {
    BalanceSimulator balance;
    plumb::test::PlumbProcess plumb(pipette_args(db, balance.device()), dir.path(), "19.8\n");
    plumb.wait_for_output("Weighing 1 of 10");
    for (std::size_t i = 0; i < 3; ++i) {
      balance.send("+  " + ten[i] + " g\r\n");
      plumb.wait_for_output(fmt::format("weighing {} counted", i + 1));
    }
    balance.close_line();
    const auto r = plumb.wait();
    CHECK(r.status == 2);
    CHECK_THAT(r.err, Catch::Contains("closed after 3 of 10 weighings") && Catch::EndsWith("nothing was written.\n"));
  }
  SECTION("Ctrl-C") {
    BalanceSimulator balance;
    plumb::test::PlumbProcess plumb(pipette_args(db, balance.device()), dir.path(), "19.8\n");
    plumb.wait_for_output("Weighing 1 of 10");
    balance.send("+  0.09971 g\r\n");
    plumb.wait_for_output("weighing 1 counted");
    plumb.signal(SIGINT);
    const auto r = plumb.wait();
    CHECK(r.status == 130);
    CHECK(r.err == "plumb: interrupted after 1 of 10 weighings; nothing was written.\n");
  }
  SECTION("the typed input ends before the end temperature") {
    std::string keys = "19.8\n";
    for (const auto& w : ten) keys += w + "\n";
    const auto r = run_plumb(pipette_args(db, "typed"), dir.path(), keys);
    CHECK(r.status == 2);
    CHECK(r.err == "plumb: the typed input ended after 10 of 10 weighings; nothing was written.\n");
  }
  CHECK(plumb::test::dump_database(db) == before);
}

TEST_CASE("pipette capture typed at a real terminal: the prompts a technician sees", "[capture][pipette]") {
  plumb::test::ScratchDir dir;
  const auto db = pipette_lab(dir);
  Terminal terminal;
  plumb::test::PlumbProcess plumb(pipette_args(db, "typed"), dir.path(), "", terminal.slave(), terminal.slave(), true);
  terminal.release_slave();
  terminal.wait_for("Gravimetric check of pipette P-07 (1 channel(s)) to ISO 8655-6:2002 on balance SM-02");
  terminal.wait_for("Water temperature at the start (degC, as the thermometer shows it, e.g. 20.5):");
  terminal.type("19.8\n");
  terminal.wait_for("Step: set pipette P-07 to 100 uL; fit a new tip and pre-wet it.");
  terminal.wait_for(
      "Weighing 1 of 10 (100 uL, channel 1, replicate 1 of 10): tare the balance, dispense into the "
      "vessel; when the display is stable, type the reading:");
  terminal.type("0.09971\n");
  terminal.wait_for("weighing 1 counted: 0.09971 g   n = 1, mean = 0.099710 g");
  terminal.type("0.09965\n");
  // n = 2: mean (0.09971 + 0.09965) / 2 = 0.09968 g; s = 0.00006 / sqrt 2 = 0.0000424 g (printed to d / 10).
  terminal.wait_for("weighing 2 counted: 0.09965 g   n = 2, mean = 0.099680 g, s = 0.000042 g");
  for (std::size_t i = 2; i < ten.size(); ++i) {
    terminal.type(ten[i] + "\n");
    terminal.wait_for(fmt::format("weighing {} counted", i + 1));
  }
  terminal.wait_for("All 10 weighings are in. Water temperature at the end (degC):");
  terminal.type("20.2\n");
  terminal.read_to_end();
  const auto r = plumb.wait();
  INFO(terminal.screen() << r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(terminal.screen(), Catch::Contains("PASS"));
  check_worked_pipette_results(
      json::parse(run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path()).out));
}

TEST_CASE("calibration capture from the balance: the plan's loads in order, the same run as check record",
          "[capture][calibration]") {
  plumb::test::ScratchDir captured, recorded;
  const auto db_c = plumb::test::calibration_lab(captured).string();
  const auto db_r = plumb::test::calibration_lab(recorded).string();
  const std::string run_file = plumb::test::calibration_run_file();
  captured.write("plan.csv", plan_of(run_file));
  const auto readings = readings_of(run_file);
  REQUIRE(readings.size() == 20);
  BalanceSimulator balance;
  plumb::test::PlumbProcess plumb(calibration_args(db_c, balance.device()), captured.path());
  plumb.wait_for_output(
      "Reading 1 of 20 (as found, plan line 2): repeatability, W100 on the centre of the pan, "
      "reading 1 of 10");
  balance.send("?  100.0009 g\r\n");
  plumb.wait_for_output("is marked unstable");
  balance.send("+  100.00031 g\r\n");
  plumb.wait_for_output("shows more decimals than the readability 0.1 mg of BAL-C allows.");
  for (std::size_t i = 0; i < readings.size(); ++i) {
    if (i == 10) plumb.wait_for_output("eccentricity, W100 at the centre of the pan");
    if (i == 11) plumb.wait_for_output("eccentricity, W100 at the front left of the pan");
    if (i == 18) plumb.wait_for_output("indication, W100 + W50 on the centre of the pan, loading up");
    balance.send("+  " + readings[i] + " g\r\n");
    plumb.wait_for_output(fmt::format("reading {} counted", i + 1));
  }
  const auto r = plumb.wait();
  INFO(r.out << r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("Verdict: PASS"));

  recorded.write("cal.csv", run_file);
  const auto rec = run_plumb({"--db",        db_r,         "check",        "record",        "BAL-C",     "--procedure",
                              "calibration", "--readings", "cal.csv",      "--temperature", "20C",       "--pressure",
                              "1013.25hPa",  "--humidity", "50%",          "--air-formula", "oiml-r111", "--on",
                              "2026-11-30",  "--as",       "A. Technician"},
                             recorded.path());
  INFO(rec.err);
  REQUIRE(rec.status == 0);
  const json a =
      json::parse(run_plumb({"--db", db_c, "check", "show", "LAST", "--format", "json"}, captured.path()).out);
  const json b =
      json::parse(run_plumb({"--db", db_r, "check", "show", "LAST", "--format", "json"}, recorded.path()).out);
  // E = I - m_ref with zero weight corrections (tests/cli/calibration_test.cpp): +0.1, +0.2, +0.4, +0.6, +0.8 mg.
  const std::vector<std::string> exact = {"0.0001", "0.0002", "0.0004", "0.0006", "0.0008"};
  REQUIRE(a["as_found"]["loads"].size() == 5);
  for (std::size_t i = 0; i < 5; ++i) CHECK(a["as_found"]["loads"][i]["error_exact_g"] == exact[i]);
  CHECK(a["raw_lines"].size() == 22);
  CHECK(a["raw_lines"][0]["outcome"] == "unstable");
  CHECK(a["raw_lines"][2]["reading"] == 1);
  check_same_run(a, b);
  CHECK(run_plumb({"--db", db_c, "audit", "verify"}, captured.path()).status == 0);
}

TEST_CASE("calibration capture: a wrong plan is refused before the first reading, and one cut short writes nothing",
          "[capture][calibration]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::calibration_lab(dir);
  plumb::test::prepare_login(calibration_args(db.string(), "typed"), dir.path());
  const auto before = plumb::test::dump_database(db);
  // A weight the lab does not have, named by the plan's line and column.
  dir.write("plan.csv",
            "stage,part,load,position,direction\nas-found,repeatability,W100,,\n"
            "as-found,indication,W100+W7,,up\n");
  auto r = run_plumb(calibration_args(db.string(), "typed"), dir.path(), "100.0003\n");
  CHECK(r.status == 2);
  CHECK(r.err == "plumb: plan.csv line 3 column load: weight \"W7\" is not a known reference weight.\n");
  CHECK(r.out.empty());
  // A plan with readings is a run file, not a plan.
  dir.write("plan.csv", plumb::test::calibration_run_file());
  r = run_plumb(calibration_args(db.string(), "typed"), dir.path(), "");
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("plan.csv line 1: column \"reading\" belongs in a run file"));
  // Stopped after two readings.
  dir.write("plan.csv", plan_of(plumb::test::calibration_run_file()));
  r = run_plumb(calibration_args(db.string(), "typed"), dir.path(), "100.0003\n100.0004\nstop\n");
  CHECK(r.status == 2);
  CHECK(r.err == "plumb: stopped after 2 of 20 readings; nothing was written.\n");
  CHECK(plumb::test::dump_database(db) == before);
}
