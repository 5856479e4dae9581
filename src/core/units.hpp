#pragma once
// Units and exact quantities. A mass given as text with a unit ("0.1mg", "220 g") becomes an exact
// Decimal in grams; computed results are held in the strong types Mass and Volume so that a mass
// can never be added to a volume or printed without its unit.
#include <compare>
#include <string>
#include <string_view>

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

/// A computed mass in grams (binary floating point: for results, never for readings).
struct Mass {
  double g = 0.0;
  [[nodiscard]] double mg() const { return g * 1e3; }
  friend Mass operator+(Mass a, Mass b) { return {a.g + b.g}; }
  friend Mass operator-(Mass a, Mass b) { return {a.g - b.g}; }
  friend Mass operator-(Mass a) { return {-a.g}; }
  friend Mass operator*(double k, Mass a) { return {k * a.g}; }
  friend Mass operator*(Mass a, double k) { return {k * a.g}; }
  friend Mass operator/(Mass a, double k) { return {a.g / k}; }
  friend double operator/(Mass a, Mass b) { return a.g / b.g; }
  // NOLINTNEXTLINE(modernize-use-nullptr): clang-tidy 14 misreads the literal 0 of a defaulted <=>.
  friend auto operator<=>(Mass a, Mass b) = default;
};

/// A computed volume in microlitres.
struct Volume {
  double ul = 0.0;
  friend Volume operator+(Volume a, Volume b) { return {a.ul + b.ul}; }
  friend Volume operator-(Volume a, Volume b) { return {a.ul - b.ul}; }
  friend Volume operator*(double k, Volume a) { return {k * a.ul}; }
  friend Volume operator/(Volume a, double k) { return {a.ul / k}; }
  friend double operator/(Volume a, Volume b) { return a.ul / b.ul; }
  // NOLINTNEXTLINE(modernize-use-nullptr): clang-tidy 14 misreads the literal 0 of a defaulted <=>.
  friend auto operator<=>(Volume a, Volume b) = default;
};

/// An exact mass: a Decimal number of grams. Conversion from any mass unit is exact.
class ExactMass {
public:
  ExactMass() = default;
  static ExactMass from(Decimal value, MassUnit unit) { return ExactMass(value.shifted(exponent_to_gram(unit))); }
  static ExactMass grams(Decimal g) { return ExactMass(g); }
  /// Parses "100g", "0.03 mg", "-0.02mg". A bare number takes `default_unit`.
  static ExactMass parse(std::string_view text, std::string_view field, MassUnit default_unit = MassUnit::g);

  [[nodiscard]] Decimal in_grams() const { return g_; }
  [[nodiscard]] Mass approx() const { return {g_.to_double()}; }
  /// Shortest exact text in a readable unit, e.g. "0.1 mg", "220 g", "0.03 mg".
  [[nodiscard]] std::string to_string() const;

  friend ExactMass operator+(ExactMass a, ExactMass b) { return ExactMass(a.g_ + b.g_); }
  friend ExactMass operator-(ExactMass a, ExactMass b) { return ExactMass(a.g_ - b.g_); }
  friend std::strong_ordering operator<=>(ExactMass a, ExactMass b) { return a.g_ <=> b.g_; }
  friend bool operator==(ExactMass a, ExactMass b) { return a.g_ == b.g_; }

private:
  explicit ExactMass(Decimal g) : g_(g) {}
  Decimal g_;
};

/// A reading kept exactly as displayed: the text, its unit, and its exact value.
struct MassReading {
  std::string text;  ///< digits exactly as displayed, e.g. "100.0010"
  MassUnit unit = MassUnit::g;
  Decimal value;     ///< parsed from text, same scale as displayed
  [[nodiscard]] ExactMass mass() const { return ExactMass::from(value, unit); }
};

/// Formats a mass in grams with a sensible unit and significant digits for people to read.
std::string format_mass(Mass m, int significant = 4);

}  // namespace plumb
