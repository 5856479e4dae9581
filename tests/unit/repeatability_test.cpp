// The weekly check against USP <41> (rules as summarised in shared/reference-data/README.md, from memory
// of the chapter). Expected values are worked by hand in the comments, never taken from the code.
#include <catch2/catch.hpp>

#include <cmath>

#include "checks/repeatability.hpp"
#include "checks/repeatability_uncertainty.hpp"
#include "core/errors.hpp"
#include "metrology/usp41.hpp"
#include "support/margin.hpp"

using namespace plumb;
using namespace plumb::checks;
using plumb::test::mass_near;
using plumb::test::mg;
using plumb::test::percent_near;
using plumb::test::pp;
using plumb::test::ug;

// Margins: 0.001 ug (1e-9 g) or tighter for every mass, where d = 0.1 mg = 100 ug; a reading mistaken by one
// digit moves a mean by 10 ug. The hand values below carry enough digits for the margin they are held to.

namespace {

RepeatabilityInput example(const std::vector<const char*>& readings) {
  RepeatabilityInput in;
  in.balance = {ExactMass::parse("220g", "cap"), ExactMass::parse("0.1mg", "d"), ExactMass::parse("200mg", "m")};
  in.weight = {"W100", ExactMass::parse("100.00003g", "w"), Mass::grams(0.05e-3), 2.0, ExactMass::parse("100g", "n")};
  for (const char* r : readings) in.readings.push_back(ExactMass::parse(r, "reading", MassUnit::g));
  return in;
}

}  // namespace

TEST_CASE("USP <41> chapter example: s = 0.00015 g gives m_min = 0.3 g", "[usp41]") {
  // Source: USP <41> worked example as quoted in shared/reference-data/README.md (from memory).
  CHECK_THAT(usp41::minimum_weight(Mass::grams(0.00015), Mass::grams(0.0001)), mass_near(Mass::grams(0.3), ug(0.001)));
  // The 0.41 d floor: s = 0.01 mg < 0.41 d = 0.041 mg, so m_min = 2000 x 0.041 mg = 82 mg = 820 d.
  CHECK_THAT(usp41::minimum_weight(Mass::grams(0.00001), Mass::grams(0.0001)), mass_near(mg(82), ug(0.001)));
}

TEST_CASE("weekly check worked by hand: a passing balance", "[repeatability][usp41]") {
  // Readings above 100 g in units of 0.1 mg: 3,1,2,4,2,3,1,2,3,2 -> sum 23, mean 100.00023 g.
  // Deviations from 2.3: .7,-1.3,-.3,1.7,-.3,.7,-1.3,-.3,.7,-.3; squares sum to 8.10 -> s^2 = 8.1/9 = 0.9
  // (0.1 mg)^2 -> s = sqrt(0.9) x 0.1 mg = 0.0948683 mg (0.0948683298051). s/d = 0.948683.
  // m_min = 2000 x 0.0948683 mg = 189.737 mg (189.73665961) <= 200 mg: repeatability passes.
  // bias = 100.00023 - 100.00003 = 0.2 mg = 0.00019999994 % of 100.00003 g; limit 0.10 % = 100.00003 mg.
  const auto r = evaluate_repeatability(example({"100.0003", "100.0001", "100.0002", "100.0004", "100.0002", "100.0003",
                                                 "100.0001", "100.0002", "100.0003", "100.0002"}));
  CHECK(r.n == 10);
  CHECK_THAT(r.mean, mass_near(Mass::grams(100.00023), ug(1e-7)));
  CHECK_THAT(r.sd, mass_near(Mass::grams(0.0000948683298), ug(5e-8)));
  CHECK(r.sd_over_d == Approx(0.948683298).epsilon(1e-9));
  CHECK_THAT(r.bias, mass_near(mg(0.2), ug(1e-10)));  // exact, then rounded once
  CHECK_THAT(r.bias_pct, percent_near(0.00019999994, pp(1e-14)));
  CHECK_THAT(r.min_weight, mass_near(Mass::grams(0.18973665961), ug(1e-6)));
  // 0.10 % of the reference value 100.00003 g (not of the nominal 100 g, 0.03 ug less).
  CHECK_THAT(*r.bias_limit, mass_near(Mass::grams(0.10000003), ug(1e-6)));
  CHECK(r.digit_backed);
  CHECK(r.verdict == Verdict::pass);
  CHECK(r.reasons.empty());
}

TEST_CASE("weekly check worked by hand: U of the bias and of the SD", "[repeatability][uncertainty]") {
  // The passing readings above: n = 10, s^2 = 0.009 mg^2, d = 0.1 mg; weight W100 with U_w = 0.05 mg, k_w = 2.
  // Model (GUM, JCGM 100:2008 5.1.2, inputs uncorrelated, sensitivities 1; checks/repeatability_uncertainty.hpp):
  //   s^2/n          = 0.009 / 10          = 0.0009       mg^2   scatter of the mean
  //   (U_w/k_w)^2    = (0.05 / 2)^2        = 0.000625     mg^2   reference weight's certificate
  //   d^2/12         = 0.01 / 12           = 0.000833333  mg^2   rounding of the zero indication (GUM F.2.2.1)
  //   u_c^2 = 0.002358333 mg^2, u_c = 0.0485626743 mg, U = 2 u_c = 0.0971253486 mg.
  // SD (GUM E.4.3): u(s) = s / sqrt(2 (n - 1)) = 0.1 mg sqrt(0.9 / 18) = 0.1 sqrt(0.05) mg = 0.0223606798 mg,
  //   U(s) = 0.0447213595 mg.
  const auto r = evaluate_repeatability(example({"100.0003", "100.0001", "100.0002", "100.0004", "100.0002", "100.0003",
                                                 "100.0001", "100.0002", "100.0003", "100.0002"}));
  CHECK(r.uncertainty_k == 2.0);
  CHECK_THAT(r.bias_expanded_u, mass_near(mg(0.0971253486), ug(1e-6)));
  CHECK_THAT(r.sd_expanded_u, mass_near(mg(0.0447213595), ug(1e-6)));
}

TEST_CASE("weekly check U: each term counts, and a check without a known weight U keeps the other two",
          "[repeatability][uncertainty]") {
  // Without the weight's term: u_c^2 = 0.0009 + 0.000833333 = 0.001733333 mg^2, u_c = 0.0416333200 mg,
  // U = 0.0832666400 mg.
  const auto no_weight = repeatability_uncertainty({mg(std::sqrt(0.009)), 10, mg(0.1), std::nullopt, 2.0});
  CHECK_THAT(no_weight.bias_standard, mass_near(mg(0.0416333200), ug(1e-6)));
  CHECK_THAT(no_weight.bias_expanded, mass_near(mg(0.0832666400), ug(1e-6)));
  // All readings equal (s = 0), weight U = 0.05 mg at k = 2, d = 1 mg: u_c^2 = 0.000625 + 1/12 = 0.083958333 mg^2,
  // u_c = 0.2897556442 mg, U = 0.5795112884 mg; U(s) = 0.
  const auto flat = repeatability_uncertainty({mg(0), 5, mg(1), mg(0.05), 2.0});
  CHECK_THAT(flat.bias_expanded, mass_near(mg(0.5795112884), ug(1e-6)));
  CHECK_THAT(flat.sd_expanded, mass_near(mg(0), ug(1e-9)));
  // A weight certificate stated at k = 2.5 with U = 0.05 mg: u = 0.02 mg, 0.0004 mg^2, so with the passing
  // readings u_c^2 = 0.0009 + 0.0004 + 0.000833333 = 0.002133333 mg^2, U = 2 x 0.0461880215 = 0.0923760431 mg.
  const auto k25 = repeatability_uncertainty({mg(std::sqrt(0.009)), 10, mg(0.1), mg(0.05), 2.5});
  CHECK_THAT(k25.bias_expanded, mass_near(mg(0.0923760431), ug(1e-6)));
  CHECK_THROWS_AS(repeatability_uncertainty({mg(0.1), 10, mg(0.1), mg(0.05), 0.0}), InputError);
}

TEST_CASE("weekly check worked by hand: repeatability too poor for the smallest net weight", "[repeatability]") {
  // 100.0000 and 100.0004 alternating five times: mean 100.0002, every deviation 0.2 mg,
  // SS = 10 x 0.04 mg^2 = 0.4 mg^2, s^2 = 0.4/9, s = 0.21081851 mg (0.210818510678) > d = 0.1 mg (the last digit
  // is not backed; the 1-2-5 step at or above s is 0.5 mg). m_min = 2000 x 0.21081851 mg = 421.637 mg
  // (421.6370213558) > 200 mg: fail.
  const auto r = evaluate_repeatability(example({"100.0000", "100.0004", "100.0000", "100.0004", "100.0000", "100.0004",
                                                 "100.0000", "100.0004", "100.0000", "100.0004"}));
  CHECK_THAT(r.sd, mass_near(Mass::grams(0.000210818510678), ug(1e-6)));
  CHECK_THAT(r.min_weight, mass_near(Mass::grams(0.4216370213558), ug(1e-6)));
  CHECK_FALSE(r.digit_backed);
  CHECK_THAT(r.effective_resolution, mass_near(mg(0.5), ug(1e-6)));
  CHECK(r.verdict == Verdict::fail);
  REQUIRE(r.reasons.size() == 1);
  CHECK_THAT(r.reasons[0], Catch::Contains("minimum weight") && Catch::Contains("200 mg"));
}

TEST_CASE("lab limits: bias beyond the limit and an unsuitable weight both fail with reasons", "[repeatability]") {
  // Same passing readings (bias 0.2 mg) under lab limits |bias| <= 0.1 mg, s <= 0.2 mg.
  // The weight's U = 0.05 mg exceeds a third of 0.1 mg (0.0333 mg): unsuitable (USP <41>; common practice).
  auto in = example({"100.0003", "100.0001", "100.0002", "100.0004", "100.0002", "100.0003", "100.0001", "100.0002",
                     "100.0003", "100.0002"});
  in.policy.kind = TolerancePolicy::Kind::lab;
  in.policy.max_bias = ExactMass::parse("0.1mg", "b");
  in.policy.max_sd = ExactMass::parse("0.2mg", "s");
  const auto r = evaluate_repeatability(in);
  CHECK(r.verdict == Verdict::fail);
  CHECK_FALSE(r.weight_suitable);
  REQUIRE(r.reasons.size() == 2);
  CHECK_THAT(r.reasons[0], Catch::Contains("accuracy"));
  CHECK_THAT(r.reasons[1], Catch::Contains("unsuitable"));
}

TEST_CASE("a reading finer than the readability is refused with its place", "[repeatability]") {
  CHECK_THROWS_WITH(evaluate_repeatability(example({"100.0003", "100.00031", "100.0002", "100.0004", "100.0002",
                                                    "100.0003", "100.0001", "100.0002", "100.0003", "100.0002"})),
                    Catch::Contains("reading 2") && Catch::Contains("100.00031"));
}

TEST_CASE("USP <41>: not less than 10 replicate weighings, and nine are refused naming the chapter",
          "[repeatability][usp41][min-readings]") {
  // USP General Chapter <41> Balances (2013 onwards, as summarised in shared/reference-data/README.md, from
  // memory): repeatability is assessed from not less than 10 replicate weighings.
  const std::vector<const char*> ten{"100.0003", "100.0001", "100.0002", "100.0004", "100.0002",
                                     "100.0003", "100.0001", "100.0002", "100.0003", "100.0002"};
  const auto r = evaluate_repeatability(example(ten));
  CHECK(r.required_readings == 10);
  CHECK_THAT(r.readings_basis, Catch::Contains("USP General Chapter <41>") && Catch::Contains("not less than 10"));
  const std::vector<const char*> nine(ten.begin(), ten.end() - 1);
  CHECK_THROWS_WITH(evaluate_repeatability(example(nine)),
                    Catch::Contains("9 reading(s) given") && Catch::Contains("USP General Chapter <41>"));
  CHECK_THROWS_AS(evaluate_repeatability(example({"100.0002", "100.0003", "100.0002"})), InputError);
}

TEST_CASE("a lab policy sets its own minimum of readings, never below the two an SD needs",
          "[repeatability][min-readings]") {
  // Three readings 100.0002, 100.0004, 100.0003 (by hand): mean 100.0003 g, s = 0.1 mg exactly.
  auto in = example({"100.0002", "100.0004", "100.0003"});
  in.policy.kind = TolerancePolicy::Kind::lab;
  in.policy.max_bias = ExactMass::parse("0.5mg", "b");
  // Without a minimum of its own a lab policy asks for 10, as USP <41> does.
  CHECK_THROWS_WITH(evaluate_repeatability(in),
                    Catch::Contains("3 reading(s) given") && Catch::Contains("sets no minimum of its own"));
  in.policy.min_readings = 3;
  const auto r = evaluate_repeatability(in);
  CHECK(r.required_readings == 3);
  CHECK_THAT(r.readings_basis, Catch::Contains("lab's policy") && Catch::Contains("at least 3"));
  CHECK_THAT(r.sd, mass_near(mg(0.1), ug(1e-6)));
  // Fewer than 10 readings is allowed by this policy, and noted.
  REQUIRE(r.notes.size() == 1);
  CHECK_THAT(r.notes[0], Catch::Contains("Only 3 readings"));
  in.policy.min_readings = 4;
  CHECK_THROWS_WITH(evaluate_repeatability(in), Catch::Contains("3 reading(s) given") && Catch::Contains("at least 4"));
  // The statistical floor: a policy of one reading (the store refuses it; the check does not rely on that)
  // still needs two, since an SD of one reading is undefined.
  in.policy.min_readings = 1;
  CHECK(required_readings(in.policy) == min_readings_for_sd);
  in.readings.resize(1);
  CHECK_THROWS_AS(evaluate_repeatability(in), InputError);
}

TEST_CASE("the share of capacity is judged on the weight's nominal mass, not its conventional mass",
          "[repeatability][capacity]") {
  // A 200 g weight of conventional mass 200.00005 g on a 200 g balance is a full-capacity load (100 %), not a
  // load above capacity: no note about the 5 % to 100 % range of USP <41>. Without the nominal, the
  // conventional mass is 100.000025 % of capacity and the note appears.
  auto in = example({"200.0003", "200.0001", "200.0002", "200.0004", "200.0002", "200.0003", "200.0001", "200.0002",
                     "200.0003", "200.0002"});
  in.balance.capacity = ExactMass::parse("200g", "cap");
  in.weight = {"W200", ExactMass::parse("200.00005g", "w"), Mass::grams(0.08e-3), 2.0, ExactMass::parse("200g", "n")};
  CHECK(evaluate_repeatability(in).notes.empty());
  in.weight.nominal.reset();
  const auto without = evaluate_repeatability(in);
  REQUIRE(without.notes.size() == 1);
  CHECK_THAT(without.notes[0], Catch::Contains("5 % to 100 %"));
}

TEST_CASE("resolution supported by a repeatability SD follows the 1-2-5 series", "[repeatability]") {
  // 0.13 mg -> 0.2 mg; 0.2 mg stays 0.2 mg; 3.1 mg -> 5 mg; 7 mg -> 10 mg (by hand, 1-2-5 series).
  CHECK_THAT(resolution_supported_by(mg(0.13)), mass_near(mg(0.2), ug(1e-6)));
  CHECK_THAT(resolution_supported_by(mg(0.2)), mass_near(mg(0.2), ug(1e-6)));
  CHECK_THAT(resolution_supported_by(mg(3.1)), mass_near(mg(5), ug(1e-6)));
  CHECK_THAT(resolution_supported_by(mg(7)), mass_near(mg(10), ug(1e-6)));
}

TEST_CASE("boundaries: a bias exactly at the lab limit passes, one digit beyond it fails",
          "[repeatability][boundary]") {
  // Weight of conventional mass 100.0000 g exactly (U = 0.01 mg, below a third of 0.3 mg). Readings 100.0002
  // and 100.0004 five times each: mean 100.0003 g, bias +0.3 mg exactly. Simple acceptance (ILAC G8:09/2019,
  // w = 0): a result exactly on its limit passes. With the limit one digit lower (0.2 mg) it fails.
  auto in = example({"100.0002", "100.0004", "100.0002", "100.0004", "100.0002", "100.0004", "100.0002", "100.0004",
                     "100.0002", "100.0004"});
  in.weight = {"W100", ExactMass::parse("100.0000g", "w"), Mass::grams(0.01e-3), 2.0, ExactMass::parse("100g", "n")};
  in.policy.kind = TolerancePolicy::Kind::lab;
  in.policy.max_bias = ExactMass::parse("0.3mg", "b");
  const auto at_limit = evaluate_repeatability(in);
  CHECK_THAT(at_limit.bias, mass_near(mg(0.3), ug(1e-9)));
  CHECK(at_limit.verdict == Verdict::pass);
  REQUIRE(at_limit.criteria.size() == 1);
  CHECK(at_limit.criteria[0].pass);

  in.policy.max_bias = ExactMass::parse("0.2mg", "b");
  const auto beyond = evaluate_repeatability(in);
  CHECK(beyond.verdict == Verdict::fail);
  REQUIRE(beyond.criteria.size() == 1);
  CHECK_FALSE(beyond.criteria[0].pass);
}

TEST_CASE("boundaries: USP <41> minimum weight exactly at the smallest net weight passes",
          "[repeatability][boundary]") {
  // Ten identical readings: s = 0 < 0.41 d, so s is taken as 0.41 d = 0.041 mg and m_min = 2000 x 0.041 mg
  // = 82 mg exactly (USP <41>, as summarised in shared/reference-data/README.md, from memory). A declared
  // smallest net weight of 82 mg is met; 81.9 mg is not (and the criterion row says so, not only the verdict).
  auto in = example({"100.0002", "100.0002", "100.0002", "100.0002", "100.0002", "100.0002", "100.0002", "100.0002",
                     "100.0002", "100.0002"});
  in.balance.smallest_net = ExactMass::parse("82mg", "m");
  const auto at_limit = evaluate_repeatability(in);
  CHECK_THAT(at_limit.min_weight, mass_near(mg(82), ug(1e-6)));
  CHECK(at_limit.verdict == Verdict::pass);
  REQUIRE_FALSE(at_limit.criteria.empty());
  CHECK(at_limit.criteria[0].pass);

  in.balance.smallest_net = ExactMass::parse("81.9mg", "m");
  const auto below = evaluate_repeatability(in);
  CHECK(below.verdict == Verdict::fail);
  CHECK_FALSE(below.criteria[0].pass);

  // The passing worked example (m_min = 189.737 mg) against a declared 150 mg: the criterion fails even though
  // 189.7 mg is well within 1.5 x 150 mg.
  auto worked = example({"100.0003", "100.0001", "100.0002", "100.0004", "100.0002", "100.0003", "100.0001", "100.0002",
                         "100.0003", "100.0002"});
  worked.balance.smallest_net = ExactMass::parse("150mg", "m");
  const auto r = evaluate_repeatability(worked);
  CHECK(r.verdict == Verdict::fail);
  CHECK_FALSE(r.criteria[0].pass);
}
