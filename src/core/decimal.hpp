#pragma once
// An exact decimal number: value = units * 10^-scale, as read from an instrument's display.
// Readings are never held as binary floating point: "100.0010" keeps its four decimals,
// which carry the readability of the balance that displayed it.
#include <compare>
#include <cstdint>
#include <string>
#include <string_view>

namespace plumb {

// 128-bit integers hold exact sums of squares of scaled readings (GCC and clang extension).
__extension__ using Int128 = __int128;
__extension__ using UInt128 = unsigned __int128;

class Decimal {
public:
  static constexpr int max_scale = 12;

  constexpr Decimal() = default;
  constexpr Decimal(std::int64_t units, int scale) : units_(units), scale_(scale) {}

  /// Parses plain decimal text ("100.0003", "-0.5", "+12", ".5" is refused). Throws InputError naming
  /// `field` when the text is empty, not a number, has more than max_scale decimals or overflows.
  static Decimal parse(std::string_view text, std::string_view field = "value");

  [[nodiscard]] constexpr std::int64_t units() const { return units_; }
  [[nodiscard]] constexpr int scale() const { return scale_; }

  /// The same value with `scale` decimals; throws InputError if digits would be lost or it overflows.
  [[nodiscard]] Decimal rescaled(int scale) const;
  /// Multiplies by 10^exponent exactly (exponent may be negative: the scale grows).
  [[nodiscard]] Decimal shifted(int exponent) const;
  /// Number of decimals actually needed (trailing zeros dropped).
  [[nodiscard]] int significant_scale() const;

  [[nodiscard]] double to_double() const;
  /// Canonical text with exactly scale() decimals, e.g. Decimal(1000100, 4) -> "100.0100".
  [[nodiscard]] std::string to_string() const;

  friend Decimal operator+(Decimal a, Decimal b);
  friend Decimal operator-(Decimal a, Decimal b);
  friend Decimal operator-(Decimal a) { return {-a.units_, a.scale_}; }
  friend std::strong_ordering operator<=>(Decimal a, Decimal b);
  friend bool operator==(Decimal a, Decimal b) { return std::is_eq(a <=> b); }

private:
  std::int64_t units_ = 0;
  int scale_ = 0;
};

/// 10^n as a 128-bit integer, for exact sums. n in [0, 36].
Int128 pow10_i128(int n);
/// Converts a 128-bit integer to long double, rounding once.
long double to_long_double(Int128 v);

}  // namespace plumb
