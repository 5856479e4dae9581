// The guided weekly check at the bench (plumb check capture) against a balance simulator: a pseudo-terminal whose
// other end the test writes balance-like lines to, with unstable readings, a wrong unit, garbage bytes, a line
// split across reads, and a disconnect or Ctrl-C midway. And the typed path through a real terminal.
#include <catch2/catch.hpp>

#include <fcntl.h>
#include <poll.h>
#include <pty.h>
#include <signal.h>
#include <sys/ioctl.h>
#include <termios.h>
#include <unistd.h>

#include <fmt/format.h>
#include <algorithm>
#include <cerrno>
#include <chrono>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <nlohmann/json.hpp>
#include <thread>

#include "support/bench_terminals.hpp"
#include "support/margin.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::BalanceSimulator;
using plumb::test::grams_near;
using plumb::test::mg;
using plumb::test::run_plumb;
using plumb::test::Terminal;
using plumb::test::ug;
using plumb::test::within_fraction_of_d;

namespace {

std::vector<std::string> capture_args(const std::string& db, const std::string& from) {
  return {"--db",   db,   "check", "capture",    "BAL-A", "--weight",     "W100",
          "--from", from, "--on",  "2026-11-30", "--as",  "A. Technician"};
}

// Ten stable readings worked by hand: deviations from 100.0003 g in 0.1 mg are -1, +1, 0, 0, +2, -1, +1, 0, +1, 0:
// sum 3, so the mean is 100.00033 g; sum of squares 9, about the mean 9 - 10 x 0.3^2 = 8.1, s^2 = 8.1 / 9 = 0.9,
// s = sqrt(0.9) x 0.1 mg = 0.0948683298 mg. W100's conventional mass is 100 g + 0.03 mg, so the bias is 0.3 mg.
const std::vector<std::string> stable_readings{"100.0002", "100.0004", "100.0003", "100.0003", "100.0005",
                                               "100.0002", "100.0004", "100.0003", "100.0004", "100.0003"};

void check_hand_worked_results(const json& j) {
  CHECK(j["n"] == 10);
  CHECK_THAT(j["mean_g"].get<double>(), within_fraction_of_d(100.00033, mg(0.1), 100));
  CHECK_THAT(j["sd_g"].get<double>(), grams_near(0.0000948683298, ug(0.00005)));
  CHECK_THAT(j["bias_g"].get<double>(), grams_near(0.0003, ug(1e-7)));
  CHECK(j["verdict"] == "pass");
}

/// The names in `dir`, sorted.
std::vector<std::string> files_in(const std::filesystem::path& dir) {
  std::vector<std::string> names;
  for (const auto& e : std::filesystem::directory_iterator(dir)) names.push_back(e.path().filename().string());
  std::sort(names.begin(), names.end());
  return names;
}

}  // namespace

TEST_CASE("capture from a balance's output counts exactly the stable readings and keeps the raw lines", "[capture]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  BalanceSimulator balance;
  plumb::test::PlumbProcess plumb(capture_args(db, balance.device()), dir.path());
  // Each line once plumb has said what became of the one before.
  const auto line = [&](const std::string& bytes, const std::string& said) {
    balance.send(bytes);
    plumb.wait_for_output(said);
  };
  line("?  100.0009 g\r\n", "line 1: reading");            // settling: unstable, not counted
  line("+  100.0002 g\r\n", "reading 1 counted");          // reading 1
  line(std::string("\x00\xFF\x1B[2J\r\n", 7), "line 3:");  // garbage bytes
  line("+100000.4 mg\r\n", "line 4:");                     // the balance switched to mg: wrong unit
  line("+  100.00041 g\r\n", "line 5:");                   // more decimals than d = 0.1 mg
  line("+  230.0000 g\r\n", "line 6:");                    // above the capacity 220 g
  balance.send_split("+  100.00", "04 g\r\n");             // reading 2, split across two reads
  plumb.wait_for_output("reading 2 counted");
  for (std::size_t i = 2; i < stable_readings.size(); ++i)
    line("+  " + stable_readings[i] + " g\r\n", fmt::format("reading {} counted", i + 1));
  const auto r = plumb.wait();
  INFO(r.out << r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("line 1: reading \"100.0009\" g is marked unstable; it is not counted"));
  CHECK_THAT(r.out, Catch::Contains("line 3: \"\\x00\\xFF\\x1B[2J\" is not a reading"));
  CHECK_THAT(r.out, Catch::Contains("line 4: reading \"100000.4\" mg is not in g, the unit BAL-A is set to show"));
  // The same sentence as `check record` gives for the same reading in a file.
  CHECK_THAT(r.out, Catch::Contains("line 5: reading \"100.00041\" g shows more decimals than the readability "
                                    "0.1 mg of BAL-A allows."));
  CHECK_THAT(r.out, Catch::Contains("line 6: reading \"230.0000\" g is above the capacity 220 g of BAL-A."));
  CHECK_THAT(r.out, Catch::Contains("reading 10 counted: 100.0003 g   n = 10"));
  CHECK_THAT(r.out, Catch::Contains("PASS"));

  const auto show = run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path());
  REQUIRE(show.status == 0);
  const json j = json::parse(show.out);
  check_hand_worked_results(j);
  REQUIRE(j["readings"].size() == stable_readings.size());
  for (std::size_t i = 0; i < stable_readings.size(); ++i) CHECK(j["readings"][i]["text"] == stable_readings[i]);
  const auto& lines = j["raw_lines"];
  REQUIRE(lines.size() == 15);
  CHECK(lines[0]["line"] == "?  100.0009 g");
  CHECK(lines[0]["outcome"] == "unstable");
  CHECK(lines[1]["outcome"] == "counted");
  CHECK(lines[1]["reading"] == 1);
  CHECK(lines[2]["line"] == "\\x00\\xFF\\x1B[2J");
  CHECK(lines[2]["outcome"] == "not a reading");
  CHECK(lines[3]["outcome"] == "refused");
  CHECK(lines[4]["outcome"] == "refused");
  CHECK(lines[5]["outcome"] == "refused");
  CHECK(lines[6]["line"] == "+  100.0004 g");  // joined from its two pieces
  CHECK(lines[6]["reading"] == 2);
  for (const auto& l : lines)
    CHECK_THAT(l["received_at"].get<std::string>(), Catch::Matches(R"(\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z)"));
  const auto text = run_plumb({"--db", db, "check", "show", "LAST"}, dir.path());
  CHECK_THAT(text.out, Catch::Contains("Original record (15 line(s) as received"));

  // The raw lines are in the run's audit record: the trail verifies, and the record names the table.
  const auto verify = run_plumb({"--db", db, "audit", "verify"}, dir.path());
  CHECK(verify.status == 0);
  const auto log = run_plumb({"--db", db, "audit", "log", "--format", "json"}, dir.path());
  CHECK_THAT(log.out, Catch::Contains("run_raw_lines"));
}

TEST_CASE("a captured check gives the same result and record as check record of the same readings", "[capture]") {
  plumb::test::ScratchDir captured, recorded;
  const auto db_c = plumb::test::example_lab(captured).string();
  const auto db_r = plumb::test::example_lab(recorded).string();
  BalanceSimulator balance;
  plumb::test::PlumbProcess plumb(capture_args(db_c, balance.device()), captured.path());
  std::string csv = "reading\n";
  for (std::size_t i = 0; i < stable_readings.size(); ++i) {
    balance.send("ST,+" + stable_readings[i] + " g\r\n");
    plumb.wait_for_output(fmt::format("reading {} counted", i + 1));
    csv += stable_readings[i] + "\n";
  }
  REQUIRE(plumb.wait().status == 0);
  recorded.write("readings.csv", csv);
  REQUIRE(run_plumb({"--db", db_r, "check", "record", "BAL-A", "--weight", "W100", "--readings", "readings.csv", "--on",
                     "2026-11-30", "--as", "A. Technician"},
                    recorded.path())
              .status == 0);
  auto a = json::parse(run_plumb({"--db", db_c, "check", "show", "LAST", "--format", "json"}, captured.path()).out);
  auto b = json::parse(run_plumb({"--db", db_r, "check", "show", "LAST", "--format", "json"}, recorded.path()).out);
  check_hand_worked_results(a);
  CHECK(a["raw_lines"].size() == 10);
  for (auto* j : {&a, &b}) {
    j->erase("raw_lines");
    j->erase("recorded_at");
  }
  CHECK(a == b);
}

TEST_CASE("capture from the balance's port settings: the lab's line pattern and the send command", "[capture]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  BalanceSimulator balance;
  REQUIRE(run_plumb({"--db", db, "balance", "port", "BAL-A", "--device", balance.device(), "--send-command", "READ",
                     "--line-pattern", "NET: {value} {unit} {mark:OK|MOVING}", "--as", "Q. Manager"},
                    dir.path())
              .status == 0);
  // Enter pressed once for each reading: each asks the balance with READ and CR LF.
  plumb::test::PlumbProcess plumb(capture_args(db, "port"), dir.path(), std::string(10, '\n'));
  CHECK(balance.received(60) == [] {
    std::string ten;
    for (int i = 0; i < 10; ++i) ten += "READ\r\n";
    return ten;
  }());
  balance.send("NET:  100.0009 g MOVING\r\n");  // unstable in this balance's own words
  plumb.wait_for_output("line 1:");
  balance.send("ST,+100.0002 g\r\n");  // a common shape, but not this balance's: not a reading
  plumb.wait_for_output("line 2:");
  for (std::size_t i = 0; i < stable_readings.size(); ++i) {
    balance.send("NET:  " + stable_readings[i] + " g OK\r\n");
    plumb.wait_for_output(fmt::format("reading {} counted", i + 1));
  }
  const auto r = plumb.wait();
  INFO(r.out << r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("is not a serial port libserialport knows; it is read as it is"));
  CHECK_THAT(r.out, Catch::Contains("press Enter to ask the balance for the reading."));
  CHECK_THAT(r.out, Catch::Contains("line 1: reading \"100.0009\" g is marked unstable"));
  CHECK_THAT(r.out, Catch::Contains("line 2: \"ST,+100.0002 g\" is not a reading in the balance's line pattern"));
  const json j = json::parse(run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path()).out);
  check_hand_worked_results(j);
  CHECK(j["raw_lines"].size() == 12);
}

TEST_CASE("a capture cut off by a pulled cable writes nothing", "[capture]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir);
  BalanceSimulator balance;
  plumb::test::prepare_login(capture_args(db.string(), balance.device()), dir.path());  // the operator's account
  const auto before = plumb::test::dump_database(db);
  plumb::test::PlumbProcess plumb(capture_args(db.string(), balance.device()), dir.path());
  for (std::size_t i = 0; i < 4; ++i) {
    balance.send("+  " + stable_readings[i] + " g\r\n");
    plumb.wait_for_output(fmt::format("reading {} counted", i + 1));
  }
  balance.send("+  100.00");  // half a line, then the cable goes
  balance.close_line();
  const auto r = plumb.wait();
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("closed after 4 of 10 readings") && Catch::EndsWith("nothing was written.\n"));
  CHECK(plumb::test::dump_database(db) == before);
}

TEST_CASE("a capture interrupted with Ctrl-C writes nothing", "[capture]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir);
  plumb::test::prepare_login(capture_args(db.string(), "typed"), dir.path());  // the operator's account first
  const auto before = plumb::test::dump_database(db);
  const auto files_before = files_in(dir.path());
  BalanceSimulator balance;
  plumb::test::PlumbProcess plumb(capture_args(db.string(), balance.device()), dir.path());
  for (std::size_t i = 0; i < 3; ++i) {
    balance.send("+  " + stable_readings[i] + " g\r\n");
    plumb.wait_for_output(fmt::format("reading {} counted", i + 1));
  }
  plumb.signal(SIGINT);
  const auto r = plumb.wait();
  CHECK(r.status == 130);
  CHECK(r.err == "plumb: interrupted after 3 of 10 readings; nothing was written.\n");
  CHECK(plumb::test::dump_database(db) == before);
  CHECK(files_in(dir.path()) == files_before);  // no file left behind (no journal, no output)
}

TEST_CASE("typed readings at a real terminal: prompts, refusals, running summary, the record", "[capture]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  Terminal terminal;
  plumb::test::PlumbProcess plumb(capture_args(db, "typed"), dir.path(), "", terminal.slave(), terminal.slave(), true);
  terminal.release_slave();
  terminal.wait_for("Step: with the pan empty, zero (tare) the balance.");
  terminal.wait_for(
      "Reading 1 of 10: place W100 on the centre of the pan; when the display is stable, type the reading:");
  terminal.type("100.0002\n");
  terminal.wait_for("reading 1 counted: 100.0002 g   n = 1, mean = 100.00020 g");
  terminal.wait_for("Step: remove W100 from the pan and check that the balance returns to zero.");
  terminal.type("100.00041\n");  // a digit more than the balance shows: refused with check record's sentence
  terminal.wait_for(
      "typed line 2: reading \"100.00041\" g shows more decimals than the readability 0.1 mg of BAL-A "
      "allows.");
  terminal.type("one hundred\n");
  terminal.wait_for(
      "typed line 3: reading \"one hundred\" is not a number; type the reading as the balance displays it");
  terminal.type("100004 mg\n");  // a unit the balance is not set to show
  terminal.wait_for("is not in g, the unit BAL-A is set to show");
  terminal.type("100.0004 g\n");  // with its unit: counted
  // n = 2: mean 100.0003 g; s of 100.0002 and 100.0004 = 0.2 mg / sqrt 2 = 0.141 mg (printed to d/10).
  terminal.wait_for("reading 2 counted: 100.0004 g   n = 2, mean = 100.00030 g, s = 0.00014 g");
  for (std::size_t i = 2; i < stable_readings.size(); ++i) {
    terminal.type(stable_readings[i] + "\n");
    terminal.wait_for(fmt::format("reading {} counted", i + 1));
  }
  terminal.wait_for("All 10 readings are in.");
  terminal.read_to_end();
  const auto r = plumb.wait();
  INFO(terminal.screen() << r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(terminal.screen(), Catch::Contains("PASS"));
  const json j = json::parse(run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path()).out);
  check_hand_worked_results(j);
  REQUIRE(j["raw_lines"].size() == 13);
  CHECK(j["raw_lines"][2]["line"] == "one hundred");
  CHECK(j["raw_lines"][2]["source"] == "typed");
  CHECK(j["raw_lines"][2]["outcome"] == "not a reading");
  CHECK(j["readings"][1]["text"] == "100.0004");
}

TEST_CASE("Ctrl-C or stop typed at the terminal ends the capture and writes nothing", "[capture]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir);
  plumb::test::prepare_login(capture_args(db.string(), "typed"), dir.path());  // the operator's account first
  const auto before = plumb::test::dump_database(db);
  for (const std::string keys : {"\x03", "stop\n"}) {
    Terminal terminal;
    plumb::test::PlumbProcess plumb(capture_args(db.string(), "typed"), dir.path(), "", terminal.slave(),
                                    terminal.slave(), true);
    terminal.release_slave();
    terminal.wait_for("Reading 1 of 10");
    terminal.type("100.0002\n");
    terminal.wait_for("reading 1 counted");
    terminal.type(keys);
    terminal.read_to_end();
    const auto r = plumb.wait();
    if (keys == "stop\n") {
      CHECK(r.status == 2);
      CHECK(r.err == "plumb: stopped after 1 of 10 readings; nothing was written.\n");
    } else {
      CHECK(r.status == 130);
      CHECK(r.err == "plumb: interrupted after 1 of 10 readings; nothing was written.\n");
    }
    CHECK(plumb::test::dump_database(db) == before);
  }
}

TEST_CASE("typed readings through tmux: the prompts as a technician sees them", "[capture]") {
  if (std::system("command -v tmux >/dev/null 2>&1") != 0) {
    WARN("skipped: tmux is not installed (scripts/setup installs it)");
    return;
  }
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const std::string server = "plumb-capture-" + std::to_string(::getpid());
  const auto tmux = [&](const std::string& what) {
    return std::system(("tmux -L " + server + " " + what + " >/dev/null 2>&1").c_str());
  };
  const auto pane = [&] {
    const auto file = dir.file("pane.txt").string();
    std::system(("tmux -L " + server + " capture-pane -p -t capture > '" + file + "' 2>/dev/null").c_str());
    std::ifstream in(file);
    return std::string(std::istreambuf_iterator<char>(in), {});
  };
  const auto wait_for = [&](const std::string& text) {
    for (int waited_ms = 0; pane().find(text) == std::string::npos; waited_ms += 10) {
      INFO("waiting for: " << text << "\npane:\n" << pane());
      REQUIRE(waited_ms < 10000);
      std::this_thread::sleep_for(std::chrono::milliseconds(10));
    }
  };
  // The pane stays after plumb ends (remain-on-exit), so its last screen can be read.
  const std::string command = plumb::test::plumb_shell_command(capture_args(db, "typed"), dir.path());
  REQUIRE(tmux("new-session -d -s capture -x 200 -y 60 \"" + command + "\"") == 0);
  tmux("set-option -t capture remain-on-exit on");
  wait_for("type the reading:");
  tmux("send-keys -t capture 100.00041 Enter");
  wait_for("shows more decimals than the readability 0.1 mg of BAL-A allows.");
  for (const auto& reading : stable_readings) {
    tmux("send-keys -t capture " + reading + " Enter");
  }
  wait_for("All 10 readings are in.");
  wait_for("PASS");
  const std::string screen = pane();
  tmux("kill-server");
  CHECK_THAT(screen, Catch::Contains("reading 10 counted: 100.0003 g   n = 10, mean = 100.00033 g, s = 0.00009 g"));
  const json j = json::parse(run_plumb({"--db", db, "check", "show", "LAST", "--format", "json"}, dir.path()).out);
  check_hand_worked_results(j);
  CHECK(j["raw_lines"].size() == 11);
}
