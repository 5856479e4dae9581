#pragma once
// Comparisons with a margin stated in the quantity's own terms. Catch's default Approx is relative
// (1.2e-5, i.e. +-1.2 mg at 100 g), far too loose for a balance read to 0.1 mg; these matchers take the margin
// as a mass, a volume or percentage points, and print expected, actual, difference and margin with units:
//
//   CHECK_THAT(mean_g, grams_near(100.00023, mg(0.001)));              // a double in grams
//   CHECK_THAT(r.bias, mass_near(Mass::milligrams(0.2), ug(1)));       // a Mass
//   CHECK_THAT(mean_g, within_fraction_of_d(100.00023, mg(0.1), 100));  // d/100 of a 0.1 mg balance
//   CHECK_THAT(mean_ul, microlitres_near(100.01532, ul(0.000005)));
//   CHECK_THAT(bias_pct, percent_near(0.0002, pp(1e-9)));              // margin in percentage points
//
// A margin as large as the expected value itself could not tell the result from zero: such a comparison
// fails, saying so, rather than passing whatever the code returns. Header-only: tests include it directly.
#include <fmt/format.h>
#include <catch2/catch.hpp>

#include <cmath>
#include <string>

#include "core/units.hpp"

namespace plumb::test {

/// Margins and expected values written in the unit they are thought in.
inline Mass g(double v) {
  return Mass::grams(v);
}
inline Mass mg(double v) {
  return Mass::milligrams(v);
}
inline Mass ug(double v) {
  return Mass::micrograms(v);
}
inline Volume ul(double v) {
  return Volume::microlitres(v);
}
inline Volume ml(double v) {
  return Volume::millilitres(v);
}
/// A margin on a percentage, in percentage points (0.001 pp: 0.2000 % and 0.2010 % differ by 0.001 pp).
struct PercentagePoints {
  double pp = 0.0;
};
inline PercentagePoints pp(double v) {
  return {v};
}

namespace detail {

/// Shortest text that reads back as the same double, then the unit.
inline std::string with_unit(double v, const char* unit) {
  return fmt::format("{} {}", v, unit);
}

/// The one comparison behind every matcher: |actual - expected| <= margin, in one unit.
class NearMatcher {
 public:
  NearMatcher(double expected, double margin, const char* unit, std::string margin_text)
      : expected_(expected), margin_(margin), unit_(unit), margin_text_(std::move(margin_text)) {}

  [[nodiscard]] bool near(double actual) const {
    actual_ = actual;
    if (!(margin_ >= 0.0) || !std::isfinite(margin_)) return false;
    if (expected_ != 0.0 && margin_ >= std::abs(expected_)) return false;  // could not tell it from zero
    return std::isfinite(actual) && std::abs(actual - expected_) <= margin_;
  }

  [[nodiscard]] std::string describe_near() const {
    if (!(margin_ >= 0.0) || !std::isfinite(margin_))
      return fmt::format("cannot be compared: the margin {} is not a non-negative number", margin_text_);
    if (expected_ != 0.0 && margin_ >= std::abs(expected_))
      return fmt::format("cannot be compared: the margin {} is not smaller than the expected {} itself", margin_text_,
                         with_unit(expected_, unit_));
    return fmt::format("is {} within {} (actual {}, off by {:.3g} {})", with_unit(expected_, unit_), margin_text_,
                       with_unit(actual_, unit_), actual_ - expected_, unit_);
  }

 private:
  double expected_;
  double margin_;
  const char* unit_;
  std::string margin_text_;
  mutable double actual_ = 0.0;  // kept by near() for the message Catch asks for afterwards
};

/// A mass margin in the unit it was written in when that reads better than grams.
inline std::string mass_text(Mass m) {
  const double a = std::abs(m.g());
  if (a != 0.0 && a < 1e-6) return with_unit(m.ug(), "ug");
  if (a != 0.0 && a < 1.0) return with_unit(m.mg(), "mg");
  return with_unit(m.g(), "g");
}

}  // namespace detail

/// A double holding grams, within a mass margin.
class GramsNear : public Catch::MatcherBase<double> {
 public:
  GramsNear(double expected_g, Mass margin, std::string margin_text)
      : near_(expected_g, margin.g(), "g", std::move(margin_text)) {}
  bool match(const double& actual_g) const override { return near_.near(actual_g); }
  std::string describe() const override { return near_.describe_near(); }

 private:
  detail::NearMatcher near_;
};

inline GramsNear grams_near(double expected_g, Mass margin) {
  return {expected_g, margin, detail::mass_text(margin)};
}
/// Within d / divisor of the instrument's readability d (e.g. d/100 for a computed mean of readings of d).
inline GramsNear within_fraction_of_d(double expected_g, Mass d, double divisor) {
  return {expected_g, d / divisor, fmt::format("d/{} = {}", divisor, detail::mass_text(d / divisor))};
}

/// A double holding milligrams (a chart's or a certificate's axis), within a mass margin.
class MilligramsNear : public Catch::MatcherBase<double> {
 public:
  MilligramsNear(double expected_mg, Mass margin) : near_(expected_mg, margin.mg(), "mg", detail::mass_text(margin)) {}
  bool match(const double& actual_mg) const override { return near_.near(actual_mg); }
  std::string describe() const override { return near_.describe_near(); }

 private:
  detail::NearMatcher near_;
};
inline MilligramsNear milligrams_near(double expected_mg, Mass margin) {
  return {expected_mg, margin};
}

/// A Mass within a mass margin.
class MassNear : public Catch::MatcherBase<Mass> {
 public:
  MassNear(Mass expected, Mass margin) : near_(expected.g(), margin.g(), "g", detail::mass_text(margin)) {}
  bool match(const Mass& actual) const override { return near_.near(actual.g()); }
  std::string describe() const override { return near_.describe_near(); }

 private:
  detail::NearMatcher near_;
};
inline MassNear mass_near(Mass expected, Mass margin) {
  return {expected, margin};
}

/// A double holding microlitres, within a volume margin.
class MicrolitresNear : public Catch::MatcherBase<double> {
 public:
  MicrolitresNear(double expected_ul, Volume margin)
      : near_(expected_ul, margin.ul(), "uL", detail::with_unit(margin.ul(), "uL")) {}
  bool match(const double& actual_ul) const override { return near_.near(actual_ul); }
  std::string describe() const override { return near_.describe_near(); }

 private:
  detail::NearMatcher near_;
};
inline MicrolitresNear microlitres_near(double expected_ul, Volume margin) {
  return {expected_ul, margin};
}

/// A Volume within a volume margin.
class VolumeNear : public Catch::MatcherBase<Volume> {
 public:
  VolumeNear(Volume expected, Volume margin)
      : near_(expected.ul(), margin.ul(), "uL", detail::with_unit(margin.ul(), "uL")) {}
  bool match(const Volume& actual) const override { return near_.near(actual.ul()); }
  std::string describe() const override { return near_.describe_near(); }

 private:
  detail::NearMatcher near_;
};
inline VolumeNear volume_near(Volume expected, Volume margin) {
  return {expected, margin};
}

/// A double holding a percentage, within a margin in percentage points.
class PercentNear : public Catch::MatcherBase<double> {
 public:
  PercentNear(double expected_pct, PercentagePoints margin)
      : near_(expected_pct, margin.pp, "%", detail::with_unit(margin.pp, "percentage points")) {}
  bool match(const double& actual_pct) const override { return near_.near(actual_pct); }
  std::string describe() const override { return near_.describe_near(); }

 private:
  detail::NearMatcher near_;
};
inline PercentNear percent_near(double expected_pct, PercentagePoints margin) {
  return {expected_pct, margin};
}

}  // namespace plumb::test

namespace Catch {
// Masses and volumes print with their unit when a check on them fails.
template <>
struct StringMaker<plumb::Mass> {
  static std::string convert(plumb::Mass m) { return fmt::format("{} g", m.g()); }
};
template <>
struct StringMaker<plumb::Volume> {
  static std::string convert(plumb::Volume v) { return fmt::format("{} uL", v.ul()); }
};
}  // namespace Catch
