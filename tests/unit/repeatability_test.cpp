// The weekly check against USP <41> (rules as summarised in shared/reference-data/README.md, from memory
// of the chapter). Expected values are worked by hand in the comments, never taken from the code.
#include <catch2/catch.hpp>

#include "checks/repeatability.hpp"
#include "core/errors.hpp"
#include "metrology/usp41.hpp"

using namespace plumb;
using namespace plumb::checks;

namespace {

RepeatabilityInput example(const std::vector<const char*>& readings) {
  RepeatabilityInput in;
  in.balance = {ExactMass::parse("220g", "cap"), ExactMass::parse("0.1mg", "d"), ExactMass::parse("200mg", "m")};
  in.weight = {"W100", ExactMass::parse("100.00003g", "w"), Mass::grams(0.05e-3), 2.0};
  for (const char* r : readings) in.readings.push_back(ExactMass::parse(r, "reading"));
  return in;
}

}  // namespace

TEST_CASE("USP <41> chapter example: s = 0.00015 g gives m_min = 0.3 g", "[usp41]") {
  // Source: USP <41> worked example as quoted in shared/reference-data/README.md (from memory).
  CHECK(usp41::minimum_weight(Mass::grams(0.00015), Mass::grams(0.0001)).g() == Approx(0.3));
  // The 0.41 d floor: s = 0.01 mg < 0.41 d = 0.041 mg, so m_min = 2000 x 0.041 mg = 82 mg = 820 d.
  CHECK(usp41::minimum_weight(Mass::grams(0.00001), Mass::grams(0.0001)).g() == Approx(0.082));
}

TEST_CASE("weekly check worked by hand: a passing balance", "[repeatability][usp41]") {
  // Readings above 100 g in units of 0.1 mg: 3,1,2,4,2,3,1,2,3,2 -> sum 23, mean 100.00023 g.
  // Deviations from 2.3: .7,-1.3,-.3,1.7,-.3,.7,-1.3,-.3,.7,-.3; squares sum to 8.10 -> s^2 = 8.1/9 = 0.9
  // (0.1 mg)^2 -> s = sqrt(0.9) x 0.1 mg = 0.0948683 mg. s/d = 0.948683.
  // m_min = 2000 x 0.0948683 mg = 189.737 mg <= 200 mg: repeatability passes.
  // bias = 100.00023 - 100.00003 = 0.2 mg = 0.00019999994 % of 100.00003 g; limit 0.10 % = 100.00003 mg.
  const auto r = evaluate_repeatability(example({"100.0003", "100.0001", "100.0002", "100.0004", "100.0002",
                                                 "100.0003", "100.0001", "100.0002", "100.0003", "100.0002"}));
  CHECK(r.n == 10);
  CHECK(r.mean.g() == Approx(100.00023).epsilon(1e-15));
  CHECK(r.sd.g() == Approx(0.0000948683298).epsilon(1e-9));
  CHECK(r.sd_over_d == Approx(0.948683298).epsilon(1e-9));
  CHECK(r.bias.g() == Approx(0.0002).epsilon(1e-12));
  CHECK(r.bias_pct == Approx(0.00019999994).epsilon(1e-7));
  CHECK(r.min_weight.g() == Approx(0.189736660).epsilon(1e-8));
  CHECK(r.bias_limit->g() == Approx(0.10000003));
  CHECK(r.digit_backed);
  CHECK(r.verdict == Verdict::pass);
  CHECK(r.reasons.empty());
}

TEST_CASE("weekly check worked by hand: repeatability too poor for the smallest net weight", "[repeatability]") {
  // 100.0000 and 100.0004 alternating five times: mean 100.0002, every deviation 0.2 mg,
  // SS = 10 x 0.04 mg^2 = 0.4 mg^2, s^2 = 0.4/9, s = 0.21081851 mg > d = 0.1 mg (the last digit is not backed;
  // the 1-2-5 step at or above s is 0.5 mg). m_min = 2000 x 0.21081851 mg = 421.637 mg > 200 mg: fail.
  const auto r = evaluate_repeatability(example({"100.0000", "100.0004", "100.0000", "100.0004", "100.0000",
                                                 "100.0004", "100.0000", "100.0004", "100.0000", "100.0004"}));
  CHECK(r.sd.g() == Approx(0.00021081851).epsilon(1e-8));
  CHECK(r.min_weight.g() == Approx(0.421637).epsilon(1e-5));
  CHECK_FALSE(r.digit_backed);
  CHECK(r.effective_resolution.g() == Approx(0.0005));
  CHECK(r.verdict == Verdict::fail);
  REQUIRE(r.reasons.size() == 1);
  CHECK_THAT(r.reasons[0], Catch::Contains("minimum weight") && Catch::Contains("200 mg"));
}

TEST_CASE("lab limits: bias beyond the limit and an unsuitable weight both fail with reasons", "[repeatability]") {
  // Same passing readings (bias 0.2 mg) under lab limits |bias| <= 0.1 mg, s <= 0.2 mg.
  // The weight's U = 0.05 mg exceeds a third of 0.1 mg (0.0333 mg): unsuitable (USP <41>; common practice).
  auto in = example({"100.0003", "100.0001", "100.0002", "100.0004", "100.0002", "100.0003", "100.0001",
                     "100.0002", "100.0003", "100.0002"});
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

TEST_CASE("readings finer than the readability and too few readings are refused", "[repeatability]") {
  CHECK_THROWS_AS(evaluate_repeatability(example({"100.00031", "100.0002"})), InputError);
  CHECK_THROWS_AS(evaluate_repeatability(example({"100.0002"})), InputError);
}

TEST_CASE("resolution supported by a repeatability SD follows the 1-2-5 series", "[repeatability]") {
  CHECK(resolution_supported_by(Mass::grams(0.00013)).g() == Approx(0.0002));
  CHECK(resolution_supported_by(Mass::grams(0.0002)).g() == Approx(0.0002));
  CHECK(resolution_supported_by(Mass::grams(0.0031)).g() == Approx(0.005));
  CHECK(resolution_supported_by(Mass::grams(0.007)).g() == Approx(0.01));
}
