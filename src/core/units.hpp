#pragma once
// Units and exact quantities. A mass given as text with a unit ("0.1mg", "220 g") becomes an exact
// Decimal in grams; computed results are held in the strong types Mass and Volume so that a mass
// can never be added to a volume or printed without its unit.
#include <cmath>
#include <compare>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "core/decimal.hpp"

namespace plumb {

enum class MassUnit { ug, mg, g, kg };
enum class VolumeUnit { ul, ml };

/// Parses "ug" (also "µg", "mcg"), "mg", "g", "kg". Throws InputError naming `field`.
MassUnit parse_mass_unit(std::string_view text, std::string_view field = "unit");
VolumeUnit parse_volume_unit(std::string_view text, std::string_view field = "unit");
std::string_view to_string(MassUnit u);
std::string_view to_string(VolumeUnit u);
/// Power of ten that turns the unit into grams (mg -> -3) or microlitres (mL -> 3).
int exponent_to_gram(MassUnit u);
int exponent_to_microlitre(VolumeUnit u);

/// A computed mass (binary floating point: for results, never for readings). Made only through a named
/// constructor, so a bare number can never become a mass without saying its unit:
/// Mass::milligrams(0.1), never Mass{0.1}. Read in any unit with g(), mg(), ug().
class Mass {
 public:
  constexpr Mass() = default;  ///< zero
  [[nodiscard]] static constexpr Mass grams(double g) { return Mass(g); }
  [[nodiscard]] static constexpr Mass milligrams(double mg) { return Mass(mg / 1e3); }
  [[nodiscard]] static constexpr Mass micrograms(double ug) { return Mass(ug / 1e6); }
  [[nodiscard]] static constexpr Mass kilograms(double kg) { return Mass(kg * 1e3); }

  [[nodiscard]] constexpr double g() const { return g_; }
  [[nodiscard]] constexpr double mg() const { return g_ * 1e3; }
  [[nodiscard]] constexpr double ug() const { return g_ * 1e6; }

  friend constexpr Mass operator+(Mass a, Mass b) { return Mass(a.g_ + b.g_); }
  friend constexpr Mass operator-(Mass a, Mass b) { return Mass(a.g_ - b.g_); }
  friend constexpr Mass operator-(Mass a) { return Mass(-a.g_); }
  friend constexpr Mass operator*(double k, Mass a) { return Mass(k * a.g_); }
  friend constexpr Mass operator*(Mass a, double k) { return Mass(k * a.g_); }
  friend constexpr Mass operator/(Mass a, double k) { return Mass(a.g_ / k); }
  friend constexpr double operator/(Mass a, Mass b) { return a.g_ / b.g_; }
  constexpr Mass& operator+=(Mass b) { return *this = *this + b; }
  constexpr Mass& operator-=(Mass b) { return *this = *this - b; }
  // NOLINTNEXTLINE(modernize-use-nullptr): clang-tidy 14 misreads the literal 0 of a defaulted <=>.
  friend constexpr auto operator<=>(Mass a, Mass b) = default;

 private:
  explicit constexpr Mass(double g) : g_(g) {}
  double g_ = 0.0;
};

/// |m|, a mass again (std::abs of the grams, so -0 becomes +0 as it would for a double).
[[nodiscard]] inline Mass abs(Mass m) {
  return Mass::grams(std::abs(m.g()));
}

/// A computed volume, made like Mass only through a named constructor and read with ul() or ml().
class Volume {
 public:
  constexpr Volume() = default;  ///< zero
  [[nodiscard]] static constexpr Volume microlitres(double ul) { return Volume(ul); }
  [[nodiscard]] static constexpr Volume millilitres(double ml) { return Volume(ml * 1e3); }

  [[nodiscard]] constexpr double ul() const { return ul_; }
  [[nodiscard]] constexpr double ml() const { return ul_ / 1e3; }

  friend constexpr Volume operator+(Volume a, Volume b) { return Volume(a.ul_ + b.ul_); }
  friend constexpr Volume operator-(Volume a, Volume b) { return Volume(a.ul_ - b.ul_); }
  friend constexpr Volume operator-(Volume a) { return Volume(-a.ul_); }
  friend constexpr Volume operator*(double k, Volume a) { return Volume(k * a.ul_); }
  friend constexpr Volume operator*(Volume a, double k) { return Volume(k * a.ul_); }
  friend constexpr Volume operator/(Volume a, double k) { return Volume(a.ul_ / k); }
  friend constexpr double operator/(Volume a, Volume b) { return a.ul_ / b.ul_; }
  // NOLINTNEXTLINE(modernize-use-nullptr): clang-tidy 14 misreads the literal 0 of a defaulted <=>.
  friend constexpr auto operator<=>(Volume a, Volume b) = default;

 private:
  explicit constexpr Volume(double ul) : ul_(ul) {}
  double ul_ = 0.0;
};

/// |v|, a volume again.
[[nodiscard]] inline Volume abs(Volume v) {
  return Volume::microlitres(std::abs(v.ul()));
}

/// An exact mass: a Decimal number of grams. Conversion from any mass unit is exact.
class ExactMass {
public:
  ExactMass() = default;
  static ExactMass from(Decimal value, MassUnit unit) { return ExactMass(value.shifted(exponent_to_gram(unit))); }
  static ExactMass grams(Decimal g) { return ExactMass(g); }
  /// Parses "100g", "0.03 mg", "-0.02mg". A bare number is refused ("0.03" might be g or mg, a factor of a
  /// thousand), unless the caller passes the unit a documented input implies (a readings column and --unit).
  static ExactMass parse(std::string_view text, std::string_view field,
                         std::optional<MassUnit> default_unit = std::nullopt);

  [[nodiscard]] Decimal in_grams() const { return g_; }
  [[nodiscard]] Mass approx() const { return Mass::grams(g_.to_double()); }
  /// Shortest exact text in a readable unit, e.g. "0.1 mg", "220 g", "0.03 mg".
  [[nodiscard]] std::string to_string() const;

  friend ExactMass operator+(ExactMass a, ExactMass b) { return ExactMass(a.g_ + b.g_); }
  friend ExactMass operator-(ExactMass a, ExactMass b) { return ExactMass(a.g_ - b.g_); }
  friend ExactMass operator-(ExactMass a) { return ExactMass(-a.g_); }
  friend std::strong_ordering operator<=>(ExactMass a, ExactMass b) { return a.g_ <=> b.g_; }
  friend bool operator==(ExactMass a, ExactMass b) { return a.g_ == b.g_; }

private:
  explicit ExactMass(Decimal g) : g_(g) {}
  Decimal g_;
};

/// |m|, exact.
inline ExactMass abs(ExactMass m) {
  return m < ExactMass() ? -m : m;
}
/// The exact values in grams, for the statistics layer (which works on plain decimals).
std::vector<Decimal> in_grams(std::span<const ExactMass> masses);

/// An exact volume: a Decimal number of microlitres, as typed ("100uL", "0.1 mL", "100"). Like ExactMass it
/// is made only from a Decimal with its unit (never from a bare double), and conversion is exact.
class ExactVolume {
 public:
  ExactVolume() = default;
  static ExactVolume from(Decimal value, VolumeUnit unit) {
    return ExactVolume(value.shifted(exponent_to_microlitre(unit)));
  }
  static ExactVolume microlitres(Decimal ul) { return ExactVolume(ul); }
  static ExactVolume millilitres(Decimal ml) { return from(ml, VolumeUnit::ml); }
  /// Parses "100uL", "100 uL", "0.1mL". A bare number is refused unless the caller passes the unit a documented
  /// input implies (the volume column of a weighings file is in uL). Throws InputError naming `field`.
  static ExactVolume parse(std::string_view text, std::string_view field,
                           std::optional<VolumeUnit> default_unit = std::nullopt);

  [[nodiscard]] Decimal in_microlitres() const { return ul_; }
  [[nodiscard]] Volume approx() const { return Volume::microlitres(ul_.to_double()); }
  /// The same volume with trailing zeros dropped: 100.0 uL becomes 100 uL (equal, shorter to print).
  [[nodiscard]] ExactVolume trimmed() const { return ExactVolume(ul_.rescaled(ul_.significant_scale())); }
  /// Shortest exact number of microlitres, without the unit: "100", "0.5".
  [[nodiscard]] std::string ul_text() const { return trimmed().ul_.to_string(); }
  /// ul_text() and the unit: "100 uL".
  [[nodiscard]] std::string to_string() const { return ul_text() + " uL"; }

  friend ExactVolume operator+(ExactVolume a, ExactVolume b) { return ExactVolume(a.ul_ + b.ul_); }
  friend ExactVolume operator-(ExactVolume a, ExactVolume b) { return ExactVolume(a.ul_ - b.ul_); }
  friend std::strong_ordering operator<=>(ExactVolume a, ExactVolume b) { return a.ul_ <=> b.ul_; }
  friend bool operator==(ExactVolume a, ExactVolume b) { return a.ul_ == b.ul_; }

 private:
  explicit ExactVolume(Decimal ul) : ul_(ul) {}
  Decimal ul_;
};

/// A reading kept exactly as displayed: the text, its unit, and its exact value.
struct MassReading {
  std::string text;  ///< digits exactly as displayed, e.g. "100.0010"
  MassUnit unit = MassUnit::g;
  Decimal value;     ///< parsed from text, same scale as displayed
  [[nodiscard]] ExactMass mass() const { return ExactMass::from(value, unit); }
  /// Decimals the reading shows once expressed in grams: "100.0003" g -> 4; "100000.3" mg -> 4. A reading
  /// may not show more than the readability of its balance allows.
  [[nodiscard]] int decimals_in_grams() const { return value.scale() - exponent_to_gram(unit); }
};

/// Formats a mass in grams with a sensible unit and significant digits for people to read.
std::string format_mass(Mass m, int significant = 4);

}  // namespace plumb
