// The history import parser: grouping rows into runs, run labels, and messages that name the line.
#include <catch2/catch.hpp>

#include <sstream>

#include "core/errors.hpp"
#include "core/history_csv.hpp"

using plumb::HistoryCsvParser;
using plumb::HistoryRun;

namespace {

std::vector<HistoryRun> parse(const std::string& text) {
  HistoryCsvParser p("h.csv");
  std::vector<HistoryRun> runs;
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);)
    if (auto r = p.feed(line)) runs.push_back(std::move(*r));
  if (auto r = p.finish()) runs.push_back(std::move(*r));
  return runs;
}

std::string error_of(const std::string& text) {
  try {
    parse(text);
  } catch (const plumb::InputError& e) {
    return e.what();
  }
  return "";
}

const std::string header = "instrument,procedure,date,operator,weight,reading,unit\n";

}  // namespace

TEST_CASE("consecutive rows with the same key form one run", "[history_csv]") {
  const auto runs = parse(header +
                          "BAL-A,repeatability,2024-03-04,A. Tech,W100,100.0003,g\n"
                          "BAL-A,repeatability,2024-03-04,A. Tech,W100,100000.1,mg\n"
                          "BAL-A,repeatability,2024-03-11,A. Tech,W100,100.0002,g\n"
                          "BAL-B,repeatability,2024-03-11,\"Tech, B.\",W100+W50,150.0001,g\n");
  REQUIRE(runs.size() == 3);
  CHECK(runs[0].instrument == "BAL-A");
  CHECK(runs[0].first_line == 2);
  CHECK(runs[0].last_line == 3);
  REQUIRE(runs[0].readings.size() == 2);
  CHECK(runs[0].readings[1].reading.text == "100000.1");
  CHECK(runs[0].readings[1].reading.unit == plumb::MassUnit::mg);
  CHECK(runs[0].readings[1].line == 3);
  CHECK(runs[1].date == "2024-03-11");
  CHECK(runs[1].readings.size() == 1);
  CHECK(runs[2].operator_name == "Tech, B.");
  CHECK(runs[2].weights == std::vector<std::string>{"W100", "W50"});
}

TEST_CASE("a run column separates two runs with the same key and columns may come in any order", "[history_csv]") {
  const auto runs = parse("Reading,Unit,Run,Instrument,Procedure,Date,Operator,Weights\r\n"
                          "1.0,g,r1,BAL-A,repeatability,2024-03-04,A,W1\r\n"
                          "1.1,g,r1,BAL-A,repeatability,2024-03-04,A,W1\r\n"
                          "\r\n"
                          "1.2,g,r2,BAL-A,repeatability,2024-03-04,A,W1\r\n");
  REQUIRE(runs.size() == 2);
  CHECK(runs[0].label == "r1");
  CHECK(runs[0].readings.size() == 2);
  CHECK(runs[1].label == "r2");
  CHECK(runs[1].first_line == 5);
}

TEST_CASE("bad history rows are named by line and column", "[history_csv]") {
  CHECK_THAT(error_of(header + "BAL-A,repeatability,2024-03-04,A,W1,100.0003,g\nBAL-A,repeatability,2024-03-04,A,W1,"
                               "100,0003,g\n"),
             Catch::Contains("h.csv line 3: 8 field(s) where the header has 7"));
  CHECK_THAT(error_of(header + "BAL-A,repeatability,2024-03-04,A,W1,1e5,g\n"),
             Catch::Contains("h.csv line 2 column reading: value \"1e5\""));
  CHECK_THAT(error_of(header + "BAL-A,repeatability,2024-03-04,A,W1,100.0,mL\n"),
             Catch::Contains("h.csv line 2 column unit: value \"mL\" is not a unit of mass"));
  CHECK_THAT(error_of(header + "BAL-A,repeatability,2024-03-04,,W1,100.0,g\n"),
             Catch::Contains("h.csv line 2 column operator: the value is empty"));
  CHECK_THAT(error_of("instrument,procedure,date,operator,weight,reading\n"),
             Catch::Contains("h.csv line 1: the header has no \"unit\" column"));
  CHECK_THAT(error_of("instrument,procedure,date,operator,weight,reading,unit,remarks\n"),
             Catch::Contains("h.csv line 1: header column \"remarks\" is not known"));
  CHECK_THAT(error_of(header), Catch::Contains("h.csv: has a header but no reading rows"));
  CHECK_THAT(error_of(""), Catch::Contains("h.csv: is empty"));
}

TEST_CASE("a run label may not change its key or come back later", "[history_csv]") {
  const std::string h = "run,instrument,procedure,date,operator,weight,reading,unit\n";
  CHECK_THAT(error_of(h + "r1,BAL-A,repeatability,2024-03-04,A,W1,1.0,g\nr1,BAL-B,repeatability,2024-03-04,A,W1,1.0,g\n"),
             Catch::Contains("h.csv line 3: run \"r1\" started at line 2 for BAL-A"));
  CHECK_THAT(error_of(h + "r1,BAL-A,repeatability,2024-03-04,A,W1,1.0,g\nr2,BAL-A,repeatability,2024-03-05,A,W1,1.0,g\n"
                          "r1,BAL-A,repeatability,2024-03-04,A,W1,1.0,g\n"),
             Catch::Contains("h.csv line 4 column run: value \"r1\" labels a run that ended earlier"));
}
