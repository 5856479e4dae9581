// `plumb summary` as a person reads it: a balance's bias and s in mg to the decimals its readability calls for,
// a pipette's systematic error and CV in %, and the CSV still plain numbers with the unit in the header.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include <algorithm>
#include <sstream>
#include <string>
#include <vector>

#include "support/margin.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::pp;
using plumb::test::run_plumb;

namespace {

// SM-02 (d = 0.01 mg) checked with W100 (conventional mass 100.00003 g), as in pipette_check_test.cpp: mean
// 100.000032 g, so bias +0.000002 g = +0.002 mg; s = 0.0091894 mg (worked there by hand).
const std::string balance_readings =
    "reading\n100.00003\n100.00004\n100.00002\n100.00003\n100.00005\n100.00003\n100.00002\n100.00004\n100.00003\n"
    "100.00003\n";
// The ten weighings of tests/unit/pipette_check_test.cpp ("Worked example by hand"): at 20 degC, 1013 hPa, 50 %,
// e_s = +0.01532 % and CV = 0.10479 % (ISO 8655-6 with Tanaka water density and the R 111 air density).
const char* const weighings[] = {"0.09971", "0.09965", "0.09980", "0.09958", "0.09992",
                                 "0.09975", "0.09969", "0.09983", "0.09961", "0.09977"};

/// The CSV as rows of fields; enough for this lab, whose fields hold no comma (csv_outputs_test.cpp reads awkward
/// fields back with Python's csv module).
std::vector<std::vector<std::string>> rows_of(const std::string& csv) {
  std::vector<std::vector<std::string>> rows;
  std::istringstream in(csv);
  std::string line;
  while (std::getline(in, line)) {
    std::vector<std::string> fields;
    std::istringstream cells(line + ",");
    std::string cell;
    while (std::getline(cells, cell, ',')) fields.push_back(cell);
    rows.push_back(fields);
  }
  return rows;
}

}  // namespace

TEST_CASE("summary shows balance results in mg to the readability and fills the pipette rows", "[cli][summary]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("sm02.csv", balance_readings);
  std::string w = "volume,channel,reading\n";
  for (const char* r : weighings) w += std::string("100uL,1,") + r + "\n";
  dir.write("w.csv", w);
  for (const std::vector<std::string>& step : {
           std::vector<std::string>{"--db", db, "balance", "add", "SM-02", "--capacity", "120g", "--readability",
                                    "0.01mg", "--every", "7d", "--smallest-net", "50mg", "--since", "2026-01-05"},
           {"--db", db, "check", "record", "SM-02", "--weight", "W100", "--readings", "sm02.csv", "--on", "2026-11-30",
            "--as", "A. Technician"},
           {"--db", db, "pipette", "add", "P-07", "--nominal", "100uL", "--range", "fixed", "--every", "3mo", "--since",
            "2026-06-01"},
           {"--db",      db,           "check",        "record", "P-07",       "--procedure", "gravimetric",
            "--balance", "SM-02",      "--water-temp", "20C",     "--pressure", "1013hPa",        "--humidity",
            "50%",        "--readings", "w.csv",        "--on",   "2026-12-01", "--as",        "A. Technician"},
       }) {
    const auto r = run_plumb(step, dir.path());
    INFO(r.err);
    REQUIRE(r.status == 0);
  }

  auto r = run_plumb({"--db", db, "summary", "--on", "2026-12-02"}, dir.path());
  REQUIRE(r.status == 0);
  // d = 0.01 mg: the bias to one decimal more (0.001 mg), s to two more (0.0001 mg).
  CHECK_THAT(r.out, Catch::Contains("bias +0.002 mg") && Catch::Contains("s 0.0092 mg"));
  CHECK_THAT(r.out, Catch::Contains("e_s +0.02 %") && Catch::Contains("CV 0.10 %"));
  CHECK_THAT(r.out, !Catch::Contains("e-0") && !Catch::Contains("(g)"));  // no exponent, no bare grams
  // BAL-A has no check yet: its row says never, with nothing in the result columns.
  CHECK_THAT(r.out, Catch::Contains("never"));

  r = run_plumb({"--db", db, "summary", "--on", "2026-12-02", "--format", "csv"}, dir.path());
  REQUIRE(r.status == 0);
  const auto rows = rows_of(r.out);
  REQUIRE(rows.size() == 4);  // header, BAL-A, P-07, SM-02
  const auto& header = rows[0];
  const auto column = [&](const std::string& name) {
    const auto at = std::find(header.begin(), header.end(), name);
    REQUIRE(at != header.end());
    return static_cast<std::size_t>(at - header.begin());
  };
  for (const auto& row : rows) REQUIRE(row.size() == header.size());
  const auto& p07 = rows[2];
  CHECK(p07[column("id")] == "P-07");
  CHECK(p07[column("bias_g")] == "");
  CHECK_THAT(std::stod(p07[column("systematic_error_pct")]), percent_near(0.01532, pp(0.00001)));
  CHECK_THAT(std::stod(p07[column("cv_pct")]), percent_near(0.10479, pp(0.00001)));
  const auto& sm02 = rows[3];
  CHECK(sm02[column("id")] == "SM-02");
  CHECK_THAT(std::stod(sm02[column("sd_g")]), plumb::test::grams_near(0.0000091894, plumb::test::ug(0.0001)));
  CHECK(sm02[column("cv_pct")] == "");
}
