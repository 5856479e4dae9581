// OIML R 111-1:2004 Table 5 (density limits of weights by class), as plumb holds it, and the density with its
// u that a EURAMET cg-18 buoyancy term derives from the limits. The table values are from memory of the
// standard (no copy of Table 5 is in shared/reference-data); the derivation is plumb's stated reading
// (metrology/weight_density_limits.hpp), worked by hand here.
#include <catch2/catch.hpp>

#include <cmath>

#include "metrology/weight_density_limits.hpp"

using plumb::ExactMass;
using namespace plumb::weights;

namespace {
ExactMass m(const char* s) {
  return ExactMass::parse(s, "nominal");
}
}  // namespace

TEST_CASE("OIML R 111-1:2004 Table 5 rows and the derived density, worked by hand (from memory)", "[unit][weights]") {
  // E2, 100 g and 1 kg share the ">= 100 g" row: 7810 to 8210 kg/m3 (from memory).
  const auto e2 = density_limits(WeightClass::E2, m("1kg"));
  REQUIRE(e2);
  CHECK(e2->min_kg_m3 == 7810.0);
  CHECK(*e2->max_kg_m3 == 8210.0);
  // rho = 8000 kg/m3; u = max(8210 - 8000, 8000 - 7810) / sqrt 3 = 210 / 1.7320508 = 121.2435565 kg/m3.
  const auto d = density_from_class(WeightClass::E2, m("100g"));
  REQUIRE(d);
  CHECK(d->rho_kg_m3 == 8000.0);
  CHECK(d->u_kg_m3 == Approx(121.2435565).margin(1e-6).epsilon(0));
  CHECK(d->basis.find("OIML R 111-1:2004 Table 5, class E2, >= 100 g: 7810 to 8210 kg/m3") != std::string::npos);
  // E1, 20 g: 7840 to 8170 (from memory): u = 170 / sqrt 3 = 98.1495458 kg/m3.
  CHECK(density_from_class(WeightClass::E1, m("20g"))->u_kg_m3 == Approx(98.1495458).margin(1e-6).epsilon(0));
  // A 200 g weight takes the ">= 100 g" row; a 30 g one (not a Table 1 nominal) the 20 g row.
  CHECK(density_limits(WeightClass::F1, m("200g"))->min_kg_m3 == 7390.0);
  CHECK(density_limits(WeightClass::F1, m("30g"))->min_kg_m3 == 6600.0);
  // M1, >= 100 g: a lower limit only, 4400 kg/m3 (from memory): taken as symmetric about 8000,
  // u = 3600 / sqrt 3 = 2078.4609691 kg/m3.
  const auto m1 = density_from_class(WeightClass::M1, m("500g"));
  REQUIRE(m1);
  CHECK_FALSE(m1->limits.max_kg_m3.has_value());
  CHECK(m1->u_kg_m3 == Approx(2078.4609691).margin(1e-6).epsilon(0));
  CHECK(m1->basis.find("at least 4400 kg/m3") != std::string::npos);
  // No limit: M3 at any nominal, E2 below 20 mg, F2 at 1 g (an empty cell).
  CHECK_FALSE(density_from_class(WeightClass::M3, m("1kg")).has_value());
  CHECK_FALSE(density_from_class(WeightClass::E2, m("10mg")).has_value());
  CHECK_FALSE(density_from_class(WeightClass::F2, m("1g")).has_value());
}
