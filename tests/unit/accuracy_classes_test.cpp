#include <catch2/catch.hpp>

#include "core/errors.hpp"
#include "metrology/accuracy_classes.hpp"

using namespace plumb;
using r76::AccuracyClass;

namespace {
ExactMass g(const char* s) { return ExactMass::parse(s, "mass", MassUnit::g); }
}  // namespace

TEST_CASE("R 76 MPE from class, e and load, in service twice initial", "[unit][r76]") {
  // Class II, e = 0.01 g (hand, OIML R 76-1 Table 6): 50 g = 5000 e -> 0.5 e = 0.005 g initial, 0.01 g in service;
  // 50.01 g = 5001 e -> 1 e = 0.01 g initial, 0.02 g in service; 200 g = 20000 e -> 1 e; 200.01 g -> 1.5 e.
  CHECK(r76::mpe(AccuracyClass::II, g("0.01"), g("50"), r76::Verification::initial) == g("0.005"));
  CHECK(r76::mpe(AccuracyClass::II, g("0.01"), g("50"), r76::Verification::in_service) == g("0.01"));
  CHECK(r76::mpe(AccuracyClass::II, g("0.01"), g("50.01"), r76::Verification::initial) == g("0.01"));
  CHECK(r76::mpe(AccuracyClass::II, g("0.01"), g("50.01")) == g("0.02"));
  CHECK(r76::mpe(AccuracyClass::II, g("0.01"), g("200"), r76::Verification::initial) == g("0.01"));
  CHECK(r76::mpe(AccuracyClass::II, g("0.01"), g("200.01"), r76::Verification::initial) == g("0.015"));
  CHECK(r76::mpe(AccuracyClass::II, g("0.01"), g("0"), r76::Verification::initial) == g("0.005"));
  // Class I has no upper band limit: 1 000 000 e -> 1.5 e.
  CHECK(r76::mpe(AccuracyClass::I, g("0.001"), g("1000"), r76::Verification::initial) == g("0.0015"));
  // Class III above 10 000 e is not covered.
  CHECK_THROWS_WITH(r76::mpe(AccuracyClass::III, g("1"), g("10001")), Catch::Contains("load"));
  CHECK_THROWS_WITH(r76::mpe(AccuracyClass::III, g("0"), g("10")), Catch::Contains("e"));
  CHECK(r76::parse_accuracy_class("iii") == AccuracyClass::III);
  CHECK(r76::parse_accuracy_class("4") == AccuracyClass::IIII);
  CHECK_THROWS_AS(r76::parse_accuracy_class("V"), InputError);
}
