// The results a repeatability run stores, written straight to text, against nlohmann's own object and dump()
// of the same result (the reference: the library that reads the stored text back).
#include <catch2/catch.hpp>

#include <fmt/format.h>

#include <cmath>
#include <limits>
#include <nlohmann/json.hpp>
#include <random>
#include <regex>

#include "checks/repeatability.hpp"
#include "report/runs/json.hpp"
#include "report/weekly_check/json.hpp"
#include "report/format/json_text.hpp"

using namespace plumb;
using nlohmann::json;

namespace {

json expected_results(const checks::RepeatabilityResult& r, const TolerancePolicy& p) {
  json j = report::to_json(r);
  j["policy"] = p.key();
  j["policy_name"] = p.name();
  return j;
}

/// The text with every number replaced by '#': what must agree byte for byte when the numbers are allowed to
/// differ in form. (fmt writes the shortest digits that read back as the same double; nlohmann's Grisu2
/// sometimes writes one digit more, as in 967.2351798188311 against 967.235179818831: the same double.)
std::string without_numbers(const std::string& text) {
  static const std::regex number("-?[0-9][0-9.eE+-]*");
  return std::regex_replace(text, number, "#");
}

}  // namespace

TEST_CASE("stored repeatability results text equals nlohmann's object and dump, over 2,000 generated runs",
          "[check_json]") {
  std::mt19937_64 rng(20261202);
  std::uniform_int_distribution<int> scatter_of(0, 40), spread(-1, 1), count_of(2, 12), policy_of(0, 2);
  long long parsed_equal = 0, shape_equal = 0, runs = 0;
  for (int k = 0; k < 2000; ++k) {
    checks::RepeatabilityInput in;
    in.balance = {ExactMass::parse("220g", "cap"), ExactMass::parse("0.1mg", "d"),
                  k % 3 == 0 ? std::nullopt : std::optional(ExactMass::parse("200mg", "m"))};
    in.weight = {"W100", ExactMass::parse("100.00003g", "w"), Mass::grams(0.05e-3), 2.0, ExactMass::parse("100g", "n")};
    const int scatter = scatter_of(rng), policy = policy_of(rng);
    // USP <41> asks for not less than 10 replicate weighings; the lab policies here allow 2, so short runs
    // are generated too.
    const int n = policy == 0 ? std::max(count_of(rng), 10) : count_of(rng);
    for (int i = 0; i < n; ++i) {
      const int units = 1000000 + 200 + scatter * spread(rng) + k % 7;  // in 0.1 mg, about 100.02 g
      in.readings.push_back(ExactMass::grams(Decimal::parse(fmt::format("{}.{:04}", units / 10000, units % 10000))));
    }
    if (policy > 0) {
      in.policy.kind = TolerancePolicy::Kind::lab;
      in.policy.max_bias = ExactMass::parse("0.5mg", "b");
      in.policy.min_readings = 2;
      if (policy == 2) in.policy.max_sd = ExactMass::parse("0.2mg", "s");
    }
    const auto r = checks::evaluate_repeatability(in);
    const json expected = expected_results(r, in.policy);
    const std::string text = report::repeatability_results_text(r, in.policy.key(), in.policy.name());
    ++runs;
    if (json::parse(text) == expected) ++parsed_equal;
    else INFO(text);
    if (without_numbers(text) == without_numbers(expected.dump())) ++shape_equal;
  }
  // Read back, every member equals nlohmann's, every double exactly.
  CHECK(parsed_equal == runs);
  // And the text is nlohmann's byte for byte apart from the digits of numbers: same members in the same
  // order, same escapes.
  CHECK(shape_equal == runs);
}

TEST_CASE("JSON text: numbers, nesting and escapes as nlohmann writes them", "[check_json]") {
  std::string out;
  report::JsonText j(out);
  const double nan = std::numeric_limits<double>::quiet_NaN();
  j.object();
  j.key("a").value(100.0);
  j.key("b").value(-0.0);
  j.key("c").value(1e-05);
  j.key("d").value(1e16);
  j.key("e").value(nan);
  j.key("f").value(0.1);
  j.key("f2").value(967.235179818831);  // nlohmann writes ...8311, the same double
  j.key("g").array().value(1LL).value(true).null().object().key("x").value("q\"uo\\te").end().array().end().end();
  j.key("h").value("caf\xc3\xa9 \x01");
  j.end();
  json expected = json::object();
  expected["a"] = 100.0;
  expected["b"] = -0.0;
  expected["c"] = 1e-05;
  expected["d"] = 1e16;
  expected["e"] = nan;
  expected["f"] = 0.1;
  expected["f2"] = 967.235179818831;
  expected["g"] = json::array({1, true, nullptr, json{{"x", "q\"uo\\te"}}, json::array()});
  expected["h"] = "caf\xc3\xa9 \x01";
  CHECK(json::parse(out) == json::parse(expected.dump()));  // NaN is written as null by both
  CHECK(without_numbers(out) == without_numbers(expected.dump()));
  CHECK(out.find(R"("a":100.0,"b":-0.0,"c":1e-05,"d":1e+16,"e":null,"f":0.1,"f2":967.235179818831,)") !=
        std::string::npos);
}
