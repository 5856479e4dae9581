// External checks: water density (Tanaka et al., Metrologia 38 (2001) 301-309), air density (OIML R 111-1:2004
// Annex E approximation formula) and the ISO 8655-6 conversion factor Z, against
// shared/reference-data/metrology/water-and-air-density.csv (read in place), whose Z column agrees with a public
// transcription of the ISO 8655-6 Annex A table to the 4 decimals published there.
#include <catch2/catch.hpp>

#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "core/decimal.hpp"
#include "metrology/density.hpp"
#include "metrology/gravimetric.hpp"
#include "support/csv.hpp"
#include "support/paths.hpp"

namespace {

std::vector<std::vector<std::string>> read_csv(const std::filesystem::path& file, const std::string& header) {
  return plumb::test::read_reference_rows(file, header);
}

/// Half a unit in the last printed decimal of `text`: the check value agrees to the digits it shows.
double half_last_digit(const std::string& text) {
  const plumb::Decimal d = plumb::Decimal::parse(text);
  return 0.5 * plumb::Decimal(1, d.scale()).to_double();
}

}  // namespace

TEST_CASE("Water density at 20 degC is 998.2067 kg/m3 (Tanaka et al. 2001)", "[reference][density]") {
  // Tanaka et al. 2001, Table of the paper / the published formula: 998.2067 kg/m3 at 20 degC (ITS-90),
  // air-free water at 101.325 kPa. Checked to the 4 decimals published.
  CHECK(plumb::density::water_tanaka(20.0) == Approx(998.2067).margin(0.00005).epsilon(0));
}

TEST_CASE("Z factor at 20, 21.5 and 25 degC (ISO 8655-6 Annex A, 101.3 kPa)", "[reference][gravimetric]") {
  // Values: water-and-air-density.csv (5 decimals, 1013 hPa, 50 %RH); they round to the ISO 8655-6 Annex A
  // table's 1.0029, 1.0032, 1.0040 at 101.3 kPa as quoted in the CSV's header.
  const auto z = [](double t) { return plumb::gravimetric::z_factor({t, 1013.0, 50.0}).z_ul_per_mg; };
  CHECK(z(20.0) == Approx(1.00285).margin(0.000005).epsilon(0));
  CHECK(z(21.5) == Approx(1.00317).margin(0.000005).epsilon(0));
  CHECK(z(25.0) == Approx(1.00400).margin(0.000005).epsilon(0));
  // The 4-decimal Annex A values themselves.
  CHECK(z(20.0) == Approx(1.0029).margin(0.00005).epsilon(0));
  CHECK(z(21.5) == Approx(1.0032).margin(0.00005).epsilon(0));
  CHECK(z(25.0) == Approx(1.0040).margin(0.00005).epsilon(0));
}

TEST_CASE("Every row of water-and-air-density.csv: water, air and Z", "[reference][density][gravimetric]") {
  const auto root = plumb::test::reference_data();
  if (!root) {
    WARN("skipped water-and-air-density.csv: shared/reference-data not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  const auto rows = read_csv(*root / "metrology" / "water-and-air-density.csv",
                             "t_c,pressure_hpa,rh_pct,rho_water_kg_m3,rho_air_kg_m3,z_ul_per_mg");
  REQUIRE(rows.size() >= 9);
  int water = 0, air = 0, z = 0;
  for (const auto& r : rows) {
    REQUIRE(r.size() == 6);
    const double t = std::stod(r[0]), p = std::stod(r[1]), h = std::stod(r[2]);
    INFO("row t=" << r[0] << " p=" << r[1] << " rh=" << r[2]);
    if (!r[3].empty()) {
      CHECK(plumb::density::water_tanaka(t) == Approx(std::stod(r[3])).margin(half_last_digit(r[3])).epsilon(0));
      ++water;
    }
    if (!r[4].empty()) {
      CHECK(plumb::density::air_oiml_r111(t, p, h) == Approx(std::stod(r[4])).margin(half_last_digit(r[4])).epsilon(0));
      ++air;
    }
    if (!r[5].empty()) {
      const auto zf = plumb::gravimetric::z_factor({t, p, h});
      CHECK(zf.z_ul_per_mg == Approx(std::stod(r[5])).margin(half_last_digit(r[5])).epsilon(0));
      ++z;
    }
  }
  CHECK(water == 9);
  CHECK(air == 1);
  CHECK(z == 5);
}
