// External check: GUM (JCGM 100:2008) Annex G, Table G.2, coverage factors k = t_p(nu) at p = 95.45 % and
// 95 %, from shared/reference-data/metrology/gum-coverage-factors.csv (transcribed from memory there).
// Boost.Math's Student's t quantile must reproduce every printed value at its printed precision.
#include <catch2/catch.hpp>
#include <fmt/format.h>

#include <cmath>
#include <limits>

#include "stats/coverage.hpp"
#include "support/csv.hpp"
#include "support/paths.hpp"

using plumb::stats::coverage_factor;

TEST_CASE("GUM Table G.2 coverage factors from Student's t (Boost.Math)", "[reference][gum][coverage]") {
  const auto root = plumb::test::reference_data();
  if (!root) {
    WARN("skipped GUM Table G.2: shared/reference-data not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  const auto t = plumb::test::read_reference_csv(*root / "metrology" / "gum-coverage-factors.csv");
  REQUIRE(t.rows.size() >= 14);
  for (const auto& row : t.rows) {
    const std::string& nu_text = row.at("nu");
    const double nu = nu_text == "inf" ? std::numeric_limits<double>::infinity() : std::stod(nu_text);
    for (const auto& [column, p] :
         {std::pair<std::string, double>{"k_95_45", plumb::stats::p_95_45()}, {"k_95", plumb::stats::p_95}}) {
      const std::string& printed = row.at(column);
      const double k = coverage_factor(nu, p);
      const double half_step = 0.5 * std::pow(10.0, -plumb::test::printed_decimals(printed));
      INFO("nu = " << nu_text << ", " << column << ": computed " << k << ", GUM Table G.2 prints " << printed);
      CHECK(std::abs(k - std::stod(printed)) <= half_step * (1 + 1e-9));
    }
  }
}
