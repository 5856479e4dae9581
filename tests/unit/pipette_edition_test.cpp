// What a gravimetric run must meet under the chosen edition of ISO 8655 (checks/pipette_edition). The 2022
// requirements (10 replicates per test volume and channel; nominal, 50 % and 10 % or the lower limit for a
// variable pipette; the lab's limits since plumb holds no 2022 table) are recalled from memory of ISO 8655-6:2022.
#include <catch2/catch.hpp>

#include "checks/pipette_edition.hpp"
#include "core/errors.hpp"

using Catch::Matchers::Contains;
namespace ck = plumb::checks;
using plumb::ExactVolume;

namespace {
ck::PipetteDefinition variable_lab_limits() {
  ck::PipetteDefinition p;
  p.id = "P-20";
  p.kind = ck::PipetteKind::variable;
  p.nominal = ExactVolume::parse("100uL", "nominal");
  p.lower_limit = ExactVolume::parse("20uL", "lower");
  p.limits.kind = plumb::pipette_limits::LimitsPolicy::Kind::lab_ul;
  p.limits.systematic = plumb::Decimal::parse("0.8");
  p.limits.random = plumb::Decimal::parse("0.3");
  return p;
}
ck::EditionVolume volume(const char* v, std::size_t n) {
  return {ExactVolume::parse(v, "volume"), {{1, n}}};
}
}  // namespace

TEST_CASE("ISO 8655:2022 requirements: replicates, test volumes, limits", "[unit][pipette][edition]") {
  const auto p = variable_lab_limits();
  // Test volumes of ISO 8655-6: 100 uL, 50 % = 50 uL, and max(10 % = 10 uL, lower limit 20 uL) = 20 uL.
  CHECK(ck::edition_shortfalls(ck::Iso8655Edition::e2022, p,
                               {volume("100uL", 10), volume("50uL", 10), volume("20uL", 10)})
            .empty());
  // 9 replicates at 50 uL, and 20 uL missing: two shortfalls, each named.
  const auto s = ck::edition_shortfalls(ck::Iso8655Edition::e2022, p, {volume("100uL", 10), volume("50uL", 9)});
  REQUIRE(s.size() == 2);
  CHECK_THAT(s[0], Contains("50 uL") && Contains("9 replicate(s)") && Contains("needs 10"));
  CHECK_THAT(s[1], Contains("20 uL is missing"));
  // The same run is fine under 2002 (plumb's rules there are checked where the run is recorded).
  CHECK(ck::edition_shortfalls(ck::Iso8655Edition::e2002, p, {volume("100uL", 4)}).empty());
  // ISO 8655-2:2002 Table 1 cannot stand for the 2022 limits.
  auto iso = p;
  iso.limits = {};
  const auto t = ck::edition_shortfalls(ck::Iso8655Edition::e2022, iso,
                                        {volume("100uL", 10), volume("50uL", 10), volume("20uL", 10)});
  REQUIRE(t.size() == 1);
  CHECK_THAT(t[0], Contains("ISO 8655-2:2002 Table 1"));
  CHECK(ck::required_replicates(ck::Iso8655Edition::e2022) == 10);
  CHECK_THAT(ck::edition_statement(ck::Iso8655Edition::e2022, p),
             Contains("ISO 8655-6:2022") && Contains("ISO 8655-2:2022"));
  CHECK_THROWS_AS(ck::parse_iso8655_edition("2019"), plumb::InputError);
}
