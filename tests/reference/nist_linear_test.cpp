// External check: NIST StRD linear least squares (https://www.itl.nist.gov/div898/strd/lls/).
// Norris is a real calibration (instrument reading against NIST reference); NoInt1 is a line through
// the origin whose certified R^2 is the uncentred one. Every certified value must reach LRE >= 11.
#include <catch2/catch.hpp>
#include <fmt/format.h>

#include "stats/regression.hpp"
#include "support/nist.hpp"
#include "support/paths.hpp"

using plumb::stats::Model;
using plumb::stats::log_relative_error;

namespace {

void expect_lre(const std::string& dataset, const std::string& what, double computed, double certified) {
  const double lre = log_relative_error(computed, certified);
  fmt::print("NIST StRD {:<7} {:<12} computed {:<22.15g} certified {:<22.15g} LRE {:4.1f}\n", dataset, what,
             computed, certified, lre);
  CHECK(lre >= 11.0);
}

}  // namespace

TEST_CASE("NIST StRD Norris: straight line with intercept", "[reference][nist][regression]") {
  const auto root = plumb::test::reference_data();
  if (!root) {
    WARN("skipped NIST StRD Norris: shared/reference-data not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  const auto d = plumb::test::read_nist_linear(*root / "nist-strd" / "linear" / "Norris.csv");
  REQUIRE(d.x.size() == 36);
  const auto f = plumb::stats::fit(Model::line, d.x, d.y);
  expect_lre("Norris", "B0", f.coef[0], d.certified.at("B0"));
  expect_lre("Norris", "sd(B0)", f.coef_se[0], d.certified.at("sd(B0)"));
  expect_lre("Norris", "B1", f.coef[1], d.certified.at("B1"));
  expect_lre("Norris", "sd(B1)", f.coef_se[1], d.certified.at("sd(B1)"));
  expect_lre("Norris", "residual_sd", f.residual_sd, d.certified.at("residual_sd"));
  expect_lre("Norris", "R_squared", f.r_squared, d.certified.at("R_squared"));
}

TEST_CASE("NIST StRD NoInt1: line through the origin, uncentred R^2", "[reference][nist][regression]") {
  const auto root = plumb::test::reference_data();
  if (!root) {
    WARN("skipped NIST StRD NoInt1: shared/reference-data not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  const auto d = plumb::test::read_nist_linear(*root / "nist-strd" / "linear" / "NoInt1.csv");
  REQUIRE(d.x.size() == 11);
  const auto f = plumb::stats::fit(Model::through_origin, d.x, d.y);
  expect_lre("NoInt1", "B1", f.coef[0], d.certified.at("B1"));
  expect_lre("NoInt1", "sd(B1)", f.coef_se[0], d.certified.at("sd(B1)"));
  expect_lre("NoInt1", "residual_sd", f.residual_sd, d.certified.at("residual_sd"));
  expect_lre("NoInt1", "R_squared", f.r_squared, d.certified.at("R_squared"));
}
