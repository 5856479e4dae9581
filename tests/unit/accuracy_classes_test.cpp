#include <catch2/catch.hpp>

#include "core/errors.hpp"
#include "metrology/accuracy_classes.hpp"

using namespace plumb;
using r76::AccuracyClass;

namespace {
ExactMass g(const char* s) {
  return ExactMass::parse(s, "mass", MassUnit::g);
}
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

TEST_CASE("R 76 classification: e and n = Max / e must fit the class", "[unit][r76]") {
  // OIML R 76-1:2006 Table 3 (from memory): class I e >= 1 mg, n >= 50 000; class II 1 mg <= e <= 50 mg with
  // 100 <= n <= 100 000, or e >= 100 mg with 5 000 <= n <= 100 000; class III 100 mg <= e <= 2 g with
  // 100 <= n <= 10 000, or e >= 5 g with 500 <= n <= 10 000; class IIII e >= 5 g, 100 <= n <= 1 000.
  // 3.4.1: e is 1, 2 or 5 times a power of ten. The n below are worked by hand from Max and e.
  using r76::classification_fault;
  // Class I, e = 1 mg, Max = 220 g: n = 220 000 >= 50 000.
  CHECK_FALSE(classification_fault(AccuracyClass::I, g("0.001"), g("220")));
  // Class I, e = 1 mg, Max = 50 g: n = 50 000 exactly, the edge, fits; 49.999 g gives 49 999.
  CHECK_FALSE(classification_fault(AccuracyClass::I, g("0.001"), g("50")));
  CHECK(classification_fault(AccuracyClass::I, g("0.001"), g("49.999")));
  // Class I below 1 mg: e = 0.1 mg is outside the class.
  const auto small_e = classification_fault(AccuracyClass::I, g("0.0001"), g("220"));
  REQUIRE(small_e);
  CHECK_THAT(*small_e, Catch::Contains("class I allows e of 1 mg or more") && Catch::Contains("R 76-1:2006 Table 3"));
  // The case of issue 13: class III with e = 1 mg.
  const auto class_iii = classification_fault(AccuracyClass::III, g("0.001"), g("220"));
  REQUIRE(class_iii);
  CHECK_THAT(*class_iii, Catch::Contains("class III allows e from 100 mg to 2 g, or of 5 g or more") &&
                             Catch::Contains("not e = 1 mg"));
  // Class III, e = 1 g, Max = 10 kg: n = 10 000, the top edge, fits; 10.001 kg gives 10 001.
  CHECK_FALSE(classification_fault(AccuracyClass::III, g("1"), g("10000")));
  CHECK(classification_fault(AccuracyClass::III, g("1"), g("10001")));
  // Class II, e = 10 mg, Max = 220 g: n = 22 000 fits; e = 1 mg gives n = 220 000 > 100 000.
  CHECK_FALSE(classification_fault(AccuracyClass::II, g("0.01"), g("220")));
  const auto too_many = classification_fault(AccuracyClass::II, g("0.001"), g("220"));
  REQUIRE(too_many);
  CHECK_THAT(*too_many, Catch::Contains("n = Max / e of 100 to 100000") && Catch::Contains("gives n = 220000"));
  // Class II, e = 0.1 g needs n >= 5 000: Max = 400 g gives 4 000.
  CHECK(classification_fault(AccuracyClass::II, g("0.1"), g("400")));
  CHECK_FALSE(classification_fault(AccuracyClass::II, g("0.1"), g("500")));
  // Class IIII, e = 5 g, Max = 220 g: n = 44 < 100.
  CHECK(classification_fault(AccuracyClass::IIII, g("5"), g("220")));
  CHECK_FALSE(classification_fault(AccuracyClass::IIII, g("5"), g("5000")));
  // 3.4.1: 3 mg and 25 mg are not of the form 1, 2 or 5 x 10^k; 2 mg, 5 mg and 20 mg are.
  CHECK_THAT(*classification_fault(AccuracyClass::II, g("0.003"), g("220")), Catch::Contains("3.4.1"));
  CHECK(classification_fault(AccuracyClass::II, g("0.025"), g("220")));
  CHECK_FALSE(classification_fault(AccuracyClass::II, g("0.002"), g("100")));
  CHECK_FALSE(classification_fault(AccuracyClass::II, g("0.005"), g("220")));
  CHECK_FALSE(classification_fault(AccuracyClass::II, g("0.020"), g("220")));
}
