// Units in the types: what must not compile is asserted at compile time, so a change that lets a bare
// number become a mass, a mass meet a volume, or a double reach the database breaks the build here.
// Each "must not" line is paired with its "must" twin where one exists, so that a broken trait (one that is
// false for everything) cannot pass unnoticed.
#include <catch2/catch.hpp>

#include <optional>
#include <string>
#include <type_traits>
#include <vector>

#include "checks/calibration.hpp"
#include "checks/pipette.hpp"
#include "checks/repeatability.hpp"
#include "core/units.hpp"
#include "store/row.hpp"
#include "support/margin.hpp"

using plumb::Decimal;
using plumb::ExactMass;
using plumb::ExactVolume;
using plumb::Mass;
using plumb::Volume;
using plumb::store::Value;
using plumb::test::grams_near;
using plumb::test::mass_near;
using plumb::test::microlitres_near;
using plumb::test::milligrams_near;
using plumb::test::ug;
using plumb::test::ul;
using plumb::test::volume_near;

namespace {

// Each concept asks whether an expression is well formed for the given types, in this (outside) context,
// so private constructors count as unavailable, as they are for the code that uses the types.
template <class A, class B>
concept addable = requires(A a, B b) {
  a + b;
};
template <class A, class B>
concept subtractable = requires(A a, B b) {
  a - b;
};
template <class A, class B>
concept multipliable = requires(A a, B b) {
  a* b;
};
template <class A, class B>
concept divisible = requires(A a, B b) {
  a / b;
};
template <class A, class B>
concept comparable = requires(A a, B b) {
  a < b;
};
template <class A, class B>
concept equality_comparable_with = requires(A a, B b) {
  a == b;
};
template <class T, class Arg>
concept brace_constructible = requires(Arg a) {
  T{a};
};
template <class T, class Arg>
concept paren_constructible = requires(Arg a) {
  T(a);
};
template <class Arg>
concept exact_grams_from = requires(Arg a) {
  ExactMass::grams(a);
};
template <class Arg>
concept exact_microlitres_from = requires(Arg a) {
  ExactVolume::microlitres(a);
};

// --- A computed mass is made only by a named constructor. ---
static_assert(!std::is_constructible_v<Mass, double>, "Mass(0.1): which unit?");
static_assert(!std::is_convertible_v<double, Mass>, "a double must not turn into a Mass silently");
static_assert(!brace_constructible<Mass, double>, "Mass{0.1}: which unit?");
static_assert(!paren_constructible<Mass, double>, "Mass(0.1) as a cast: which unit?");
static_assert(!brace_constructible<Mass, int>);
static_assert(!std::is_aggregate_v<Mass>, "an aggregate would accept Mass{0.1}");
static_assert(std::is_default_constructible_v<Mass>, "a default Mass is zero, for result structs");
static_assert(std::is_same_v<decltype(Mass::grams(1.0)), Mass>);
static_assert(std::is_same_v<decltype(Mass::milligrams(1.0)), Mass>);
static_assert(std::is_same_v<decltype(Mass::micrograms(1.0)), Mass>);

// --- A computed volume likewise. ---
static_assert(!std::is_constructible_v<Volume, double>, "Volume(100): uL or mL?");
static_assert(!std::is_convertible_v<double, Volume>);
static_assert(!brace_constructible<Volume, double>);
static_assert(!paren_constructible<Volume, double>);
static_assert(!std::is_aggregate_v<Volume>);
static_assert(std::is_same_v<decltype(Volume::microlitres(1.0)), Volume>);
static_assert(std::is_same_v<decltype(Volume::millilitres(1.0)), Volume>);

// --- Arithmetic that makes sense compiles; the rest does not. ---
static_assert(addable<Mass, Mass> && subtractable<Mass, Mass>);
static_assert(std::is_same_v<decltype(Mass() + Mass()), Mass>);
static_assert(std::is_same_v<decltype(2.0 * Mass()), Mass> && std::is_same_v<decltype(Mass() * 2.0), Mass>);
static_assert(std::is_same_v<decltype(Mass() / 2.0), Mass>);
static_assert(std::is_same_v<decltype(Mass() / Mass()), double>, "a ratio of masses is a plain number");
static_assert(comparable<Mass, Mass> && equality_comparable_with<Mass, Mass>);
static_assert(!addable<Mass, Volume> && !addable<Volume, Mass>, "a mass plus a volume has no unit");
static_assert(!subtractable<Mass, Volume> && !subtractable<Volume, Mass>);
static_assert(!addable<Mass, double> && !addable<double, Mass>, "Mass + 0.1: 0.1 what?");
static_assert(!subtractable<Mass, double> && !subtractable<double, Mass>);
static_assert(!comparable<Mass, double> && !equality_comparable_with<Mass, double>, "m < 0.1: 0.1 what?");
static_assert(!comparable<Mass, Volume>);
static_assert(!multipliable<Mass, Mass>, "g^2 is not a quantity plumb has");
static_assert(!divisible<Mass, Volume> && !divisible<Volume, Mass>, "no density type: refuse rather than guess");
static_assert(!divisible<double, Mass>);
static_assert(addable<Volume, Volume> && std::is_same_v<decltype(Volume() / Volume()), double>);
static_assert(!addable<Volume, double> && !comparable<Volume, double>);
static_assert(!addable<Mass, ExactMass> && !addable<ExactMass, Mass>, "exact and computed masses do not mix");

// --- Exact quantities come only from exact decimals with a unit. ---
static_assert(!std::is_constructible_v<ExactMass, double>, "an exact mass never comes from binary floating point");
static_assert(!std::is_convertible_v<double, ExactMass>);
static_assert(!brace_constructible<ExactMass, double> && !paren_constructible<ExactMass, double>);
static_assert(!std::is_constructible_v<ExactMass, Decimal>, "ExactMass::grams(d) or from(d, unit): say the unit");
static_assert(!exact_grams_from<double> && exact_grams_from<Decimal>);
static_assert(!std::is_constructible_v<Decimal, double>, "Decimal(0.1) would hold 0.1000000000000000055...");
static_assert(!std::is_constructible_v<ExactVolume, double>);
static_assert(!std::is_convertible_v<double, ExactVolume>);
static_assert(!brace_constructible<ExactVolume, double> && !paren_constructible<ExactVolume, double>);
static_assert(!std::is_constructible_v<ExactVolume, Decimal>);
static_assert(!exact_microlitres_from<double> && exact_microlitres_from<Decimal>);
static_assert(!addable<ExactMass, ExactVolume> && addable<ExactMass, ExactMass> && addable<ExactVolume, ExactVolume>);
static_assert(std::is_same_v<decltype(ExactMass().approx()), Mass>);
static_assert(std::is_same_v<decltype(ExactVolume().approx()), Volume>);

// --- The database holds exact values only: no double becomes a store::Value. ---
static_assert(!std::is_constructible_v<Value, double>, "exact values are stored as decimal TEXT");
static_assert(!std::is_convertible_v<double, Value>);
static_assert(!std::is_constructible_v<Value, float> && !std::is_constructible_v<Value, long double>);
static_assert(!brace_constructible<Value, double>);
static_assert(!std::is_constructible_v<Value, std::optional<double>>, "an optional double neither");
static_assert(!std::is_constructible_v<plumb::store::Field, std::string_view, double>);
static_assert(std::is_constructible_v<Value, std::int64_t> && std::is_constructible_v<Value, std::string>);
static_assert(std::is_constructible_v<Value, std::optional<std::string>>);

// --- Readings and results carry their units (the checks' inputs and outputs). ---
static_assert(std::is_same_v<decltype(plumb::checks::RepeatabilityInput::readings), std::vector<ExactMass>>);
static_assert(std::is_same_v<decltype(plumb::checks::RepeatabilitySeries::readings), std::vector<ExactMass>>);
static_assert(std::is_same_v<decltype(plumb::checks::LoadPoint::up), std::vector<ExactMass>>);
static_assert(std::is_same_v<decltype(plumb::checks::EccentricityPosition::reading), ExactMass>);
static_assert(std::is_same_v<decltype(plumb::checks::LoadCalibration::tolerance), Mass>);
static_assert(std::is_same_v<decltype(plumb::checks::LoadResult::error), Mass>);
static_assert(std::is_same_v<decltype(plumb::checks::Decision::expanded_uncertainty), Mass>);
static_assert(std::is_same_v<decltype(plumb::checks::PipetteDefinition::nominal), ExactVolume>);
static_assert(std::is_same_v<decltype(plumb::checks::TestVolumeWeighings::volume), ExactVolume>);
static_assert(std::is_same_v<decltype(plumb::checks::ChannelResult::systematic_error), Volume>);

}  // namespace

TEST_CASE("named constructors agree on the unit: 1 mg is 0.001 g, 1 mL is 1000 uL", "[unit][units]") {
  // By definition of the SI prefixes; each margin is stated in the quantity's own terms (1e-9 ug for masses
  // near 1 mg, 1e-9 uL for volumes near 1 mL: a few ulps, while a unit slip is off by a factor of 1000).
  CHECK_THAT(Mass::milligrams(1.0), mass_near(Mass::grams(0.001), ug(1e-9)));
  CHECK_THAT(Mass::micrograms(1000.0), mass_near(Mass::milligrams(1.0), ug(1e-9)));
  CHECK_THAT(Mass::kilograms(0.1), mass_near(Mass::grams(100.0), ug(1e-6)));
  // The readers: g() and mg() as plain numbers; ug() and ml() read back through their own constructors.
  CHECK_THAT(Mass::micrograms(1.0).mg(), milligrams_near(0.001, ug(1e-9)));
  CHECK_THAT(Mass::milligrams(250.0).g(), grams_near(0.25, ug(1e-9)));
  CHECK_THAT(Mass::micrograms(Mass::milligrams(1.0).ug()), mass_near(Mass::grams(0.001), ug(1e-9)));
  CHECK_THAT(Volume::millilitres(1.0), volume_near(Volume::microlitres(1000.0), ul(1e-9)));
  CHECK_THAT(Volume::microlitres(1000.0).ul(), microlitres_near(1000.0, ul(1e-9)));
  CHECK_THAT(Volume::millilitres(Volume::microlitres(250.0).ml()), volume_near(Volume::microlitres(250.0), ul(1e-9)));
  // Arithmetic keeps the unit: 100 g + 0.2 mg = 100.0002 g; (100.0002 g) / (100 g) = 1.000002, a plain ratio.
  const Mass sum = Mass::grams(100.0) + Mass::milligrams(0.2);
  CHECK_THAT(sum, mass_near(Mass::grams(100.0002), ug(1e-6)));
  CHECK(sum / Mass::grams(100.0) == Approx(1.000002).margin(1e-14).epsilon(0));
  CHECK_THAT(abs(Mass::milligrams(-0.3)), mass_near(Mass::milligrams(0.3), ug(1e-9)));
}

TEST_CASE("exact volumes parse like exact masses: unit, default unit, trailing zeros", "[unit][units]") {
  // 0.1 mL = 100 uL exactly; "100" takes the default unit uL; 100.0 uL equals 100 uL and prints as "100 uL".
  CHECK(ExactVolume::parse("0.1mL", "v") == ExactVolume::microlitres(Decimal::parse("100")));
  CHECK(ExactVolume::parse("100", "v", plumb::VolumeUnit::ul).in_microlitres() == Decimal::parse("100"));
  CHECK_THROWS_WITH(ExactVolume::parse("100", "--nominal"),
                    "--nominal \"100\" has no unit; write it with its unit, e.g. 100uL or 100mL.");
  CHECK(ExactVolume::parse("100.0 uL", "v").to_string() == "100 uL");
  CHECK(ExactVolume::parse("2.5 uL", "v").ul_text() == "2.5");
  CHECK(ExactVolume::millilitres(Decimal::parse("0.25")) == ExactVolume::microlitres(Decimal::parse("250")));
  CHECK_THROWS_WITH(ExactVolume::parse("5 g", "--nominal"),
                    Catch::Contains("--nominal") && Catch::Contains("uL or mL"));
  CHECK_THROWS_WITH(ExactVolume::parse("uL", "--nominal"), Catch::Contains("is not a volume"));
}
