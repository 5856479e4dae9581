// A reference weight's certificate against its class. MPE values from OIML R 111-1:2004 Table 1 as transcribed in
// shared/reference-data/metrology/oiml-r111-weight-mpe.csv ("from memory, cross-checked" there); the rule that
// the expanded uncertainty for k = 2 is at most one third of the MPE is R 111-1:2004 clause 5.2 (from memory).
// Every limit below is worked by hand from those two.
#include <catch2/catch.hpp>

#include "metrology/weight_certificate_limits.hpp"

using namespace plumb;
using weights::WeightClass;

namespace {

ExactMass m(const char* text) {
  return ExactMass::parse(text, "mass");
}
Decimal k(const char* text) {
  return Decimal::parse(text, "k");
}

weights::CertificateAgainstClass judge(WeightClass c, const char* nominal, const char* correction, const char* u,
                                       const char* coverage = "2") {
  return weights::judge_certificate(c, m(nominal), m(correction), m(u), k(coverage));
}

}  // namespace

TEST_CASE("correction within the R 111 MPE of the class, both signs, the limit itself included", "[unit][r111]") {
  // CSV row "100 g": E2 MPE 0.16 mg.
  const auto on_limit = judge(WeightClass::E2, "100 g", "0.16 mg", "0.05 mg");
  REQUIRE(on_limit.mpe.has_value());
  CHECK(*on_limit.mpe == m("0.16 mg"));
  CHECK(on_limit.correction_within);
  CHECK(on_limit.within());
  CHECK(judge(WeightClass::E2, "100 g", "-0.16 mg", "0.05 mg").correction_within);
  // One microgram beyond, either side.
  CHECK_FALSE(judge(WeightClass::E2, "100 g", "0.161 mg", "0.05 mg").correction_within);
  CHECK_FALSE(judge(WeightClass::E2, "100 g", "-0.161 mg", "0.05 mg").correction_within);
  // The case of the issue: an E2 100 g weight with a 5 mg correction (31 times the MPE).
  const auto five_mg = judge(WeightClass::E2, "100 g", "5 mg", "0.05 mg");
  CHECK_FALSE(five_mg.correction_within);
  CHECK(five_mg.uncertainty_within);
  CHECK_FALSE(five_mg.within());
  // The same 5 mg is within class M1 at 100 g (CSV: M1 MPE 5.0 mg), on the limit.
  CHECK(judge(WeightClass::M1, "100 g", "5 mg", "1 mg").within());
}

TEST_CASE("expanded uncertainty at most a third of the MPE, exactly, for k = 2", "[unit][r111]") {
  // CSV row "200 g": E2 MPE 0.3 mg, so U <= 0.1 mg exactly; 0.1 mg passes and 0.1001 mg does not. Only an exact
  // comparison tells these apart (0.3 / 3 in binary floating point is 0.09999999999999999).
  CHECK(judge(WeightClass::E2, "200 g", "0 mg", "0.1 mg").uncertainty_within);
  CHECK_FALSE(judge(WeightClass::E2, "200 g", "0 mg", "0.1001 mg").uncertainty_within);
  // E2 100 g: MPE 0.16 mg, a third is 0.05333... mg: 0.053 mg within, 0.054 mg not.
  CHECK(judge(WeightClass::E2, "100 g", "0 mg", "0.053 mg").uncertainty_within);
  CHECK_FALSE(judge(WeightClass::E2, "100 g", "0 mg", "0.054 mg").uncertainty_within);
  // The case of the issue: U = 1 mg on an E2 100 g weight.
  const auto one_mg = judge(WeightClass::E2, "100 g", "0.03 mg", "1 mg");
  CHECK(one_mg.correction_within);
  CHECK_FALSE(one_mg.uncertainty_within);
  // F1 1 g: MPE 0.10 mg, a third 0.0333 mg: 0.06 mg is too much, as F2 1 g (MPE 0.3 mg, a third 0.1 mg) allows.
  CHECK_FALSE(judge(WeightClass::F1, "1 g", "0.04 mg", "0.06 mg").uncertainty_within);
  CHECK(judge(WeightClass::F2, "1 g", "0.04 mg", "0.06 mg").within());
  // Kilograms: E2 1 kg MPE 1.6 mg; U 0.5 mg within (0.5 <= 0.5333), 0.54 mg not.
  CHECK(judge(WeightClass::E2, "1 kg", "1 mg", "0.5 mg").within());
  CHECK_FALSE(judge(WeightClass::E2, "1 kg", "1 mg", "0.54 mg").uncertainty_within);
}

TEST_CASE("an uncertainty stated for another k is brought to k = 2 first", "[unit][r111]") {
  // E2 100 g, limit 0.0533 mg for k = 2. U = 0.05 mg at k = 1 is 0.10 mg at k = 2: beyond.
  CHECK_FALSE(judge(WeightClass::E2, "100 g", "0 mg", "0.05 mg", "1").uncertainty_within);
  // U = 0.075 mg at k = 3 is 0.05 mg at k = 2: within (6 x 0.075 = 0.45 <= 3 x 0.16 = 0.48).
  CHECK(judge(WeightClass::E2, "100 g", "0 mg", "0.075 mg", "3").uncertainty_within);
  // E2 200 g, limit 0.1 mg for k = 2: U = 0.105 mg at k = 2.1 is exactly 0.1 mg at k = 2 (6 x 0.105 = 0.63 = 2.1 x
  // 0.3).
  CHECK(judge(WeightClass::E2, "200 g", "0 mg", "0.105 mg", "2.1").uncertainty_within);
  CHECK_FALSE(judge(WeightClass::E2, "200 g", "0 mg", "0.1051 mg", "2.1").uncertainty_within);
  // The rounded value for messages: 0.05 mg at k = 1 -> 0.1 mg.
  CHECK(weights::uncertainty_for_k2_mg(m("0.05 mg"), k("1")) == Approx(0.1).epsilon(1e-12));
}

TEST_CASE("no MPE for a nominal value outside Table 1: not within, nothing judged", "[unit][r111]") {
  // Table 1 follows the 1-2-5 series: 150 g has no row.
  const auto odd = judge(WeightClass::E2, "150 g", "0 mg", "0.01 mg");
  CHECK_FALSE(odd.mpe.has_value());
  CHECK_FALSE(odd.within());
}
