// A failed check's certificate charts the criterion that failed (issue 14, point 5), and marks the failed runs.
// The demo lab (examples/demo-lab.json) ends TL-03's year with two checks whose minimum weight exceeds the declared
// smallest net weight of 50 g (USP <41>) while the bias stays within 0.10 % of the load: the chart must be of the
// minimum weight, not of the bias.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::run_plumb;
using plumb::test::ScratchDir;

TEST_CASE("a check failed on its minimum weight charts the minimum weight on its certificate",
          "[cli][certificate][chart-marks]") {
  ScratchDir dir;
  REQUIRE(run_plumb({"demo"}, dir.path()).status == 0);
  const std::string db = dir.file("plumb-demo.db").string();
  const auto shown = run_plumb({"--db", db, "check", "show", "168", "--format", "json"}, dir.path());
  REQUIRE(shown.status == 0);
  const json run = json::parse(shown.out);
  REQUIRE(run.at("instrument") == "TL-03");
  REQUIRE(run.at("verdict") == "fail");
  // The failed criterion, as the run stores it: minimum weight 61.2 g against 50 g; the bias criterion passed.
  std::string failed;
  bool bias_passed = false;
  for (const auto& c : run.at("criteria")) {
    if (!c.at("pass").get<bool>() && failed.empty()) failed = c.at("quantity");
    if (c.at("quantity") == "|bias|") bias_passed = c.at("pass").get<bool>();
  }
  REQUIRE(failed == "minimum weight");
  REQUIRE(bias_passed);

  REQUIRE(run_plumb({"--db", db, "certificate", "issue", "168"}, dir.path()).status == 0);
  const auto cert = run_plumb({"--db", db, "certificate", "show", "LAST", "--format", "json"}, dir.path());
  REQUIRE(cert.status == 0);
  const json h = json::parse(cert.out).at("history");
  CHECK(h.at("quantity") == "min-weight");
  CHECK(h.at("non_negative") == true);
  const auto& points = h.at("points");
  REQUIRE(points.size() >= 2);
  CHECK(points.back().at("run_id") == 168);
  CHECK(points.back().value("failed", false));
  CHECK(points[points.size() - 2].value("failed", false));        // run 165, the other failure
  CHECK_FALSE(points[points.size() - 3].value("failed", false));  // the pass before them
}
