#include "core/decimal.hpp"

#include <fmt/format.h>

#include <cmath>
#include <limits>

#include "core/errors.hpp"

namespace plumb {
namespace {

constexpr std::int64_t max_units = std::numeric_limits<std::int64_t>::max() / 10;

[[noreturn]] void refuse(std::string_view field, std::string_view text, std::string_view why) {
  throw InputError(fmt::format("{} \"{}\" {}.", field, text, why));
}

}  // namespace

Int128 pow10_i128(int n) {
  Int128 p = 1;
  for (int i = 0; i < n; ++i) p *= 10;
  return p;
}

long double to_long_double(Int128 v) {
  // Split so that both halves convert exactly; the sum rounds once.
  const bool negative = v < 0;
  UInt128 u = negative ? -static_cast<UInt128>(v) : static_cast<UInt128>(v);
  const auto high = static_cast<std::uint64_t>(u >> 64);
  const auto low = static_cast<std::uint64_t>(u);
  const long double r = std::ldexp(static_cast<long double>(high), 64) + static_cast<long double>(low);
  return negative ? -r : r;
}

Decimal Decimal::parse(std::string_view text, std::string_view field) {
  if (text.empty()) refuse(field, text, "is empty where a number is required");
  std::size_t i = 0;
  bool negative = false;
  if (text[0] == '+' || text[0] == '-') {
    negative = text[0] == '-';
    i = 1;
  }
  std::int64_t units = 0;
  int scale = 0;
  int digits = 0;
  bool seen_point = false;
  for (; i < text.size(); ++i) {
    const char c = text[i];
    if (c == '.') {
      if (seen_point) refuse(field, text, "is not a number (two decimal points)");
      if (digits == 0) refuse(field, text, "is not a number (no digit before the decimal point)");
      seen_point = true;
      continue;
    }
    if (c < '0' || c > '9') refuse(field, text, "is not a number");
    if (units > max_units) refuse(field, text, "has too many digits to keep exactly");
    units = units * 10 + (c - '0');
    ++digits;
    if (seen_point && ++scale > max_scale)
      refuse(field, text, fmt::format("has more than {} decimals", max_scale));
  }
  if (digits == 0) refuse(field, text, "is not a number");
  if (seen_point && scale == 0) refuse(field, text, "is not a number (no digit after the decimal point)");
  return {negative ? -units : units, scale};
}

Decimal Decimal::rescaled(int scale) const {
  if (scale == scale_) return *this;
  if (scale > scale_) {
    Int128 u = static_cast<Int128>(units_) * pow10_i128(scale - scale_);
    if (u > std::numeric_limits<std::int64_t>::max() || u < std::numeric_limits<std::int64_t>::min())
      throw InputError(fmt::format("value {} is too large to hold with {} decimals.", to_string(), scale));
    return {static_cast<std::int64_t>(u), scale};
  }
  const auto div = static_cast<std::int64_t>(pow10_i128(scale_ - scale));
  if (units_ % div != 0)
    throw InputError(fmt::format("value {} cannot be written with {} decimals without rounding.", to_string(), scale));
  return {units_ / div, scale};
}

Decimal Decimal::shifted(int exponent) const {
  if (exponent >= 0) {
    Decimal wider = rescaled(scale_ + exponent);
    return {wider.units_, scale_};
  }
  return {units_, scale_ - exponent};
}

int Decimal::significant_scale() const {
  int s = scale_;
  std::int64_t u = units_;
  while (s > 0 && u % 10 == 0) {
    u /= 10;
    --s;
  }
  return s;
}

double Decimal::to_double() const {
  return static_cast<double>(static_cast<long double>(units_) / to_long_double(pow10_i128(scale_)));
}

std::string Decimal::to_string() const {
  const bool negative = units_ < 0;
  const auto magnitude = static_cast<unsigned long long>(negative ? -static_cast<Int128>(units_) : units_);
  const auto divisor = static_cast<unsigned long long>(pow10_i128(scale_));
  if (scale_ == 0) return fmt::format("{}{}", negative ? "-" : "", magnitude);
  return fmt::format("{}{}.{:0{}}", negative ? "-" : "", magnitude / divisor, magnitude % divisor, scale_);
}

Decimal operator+(Decimal a, Decimal b) {
  const int s = std::max(a.scale_, b.scale_);
  a = a.rescaled(s);
  b = b.rescaled(s);
  std::int64_t r = 0;
  if (__builtin_add_overflow(a.units_, b.units_, &r))
    throw InputError(fmt::format("sum of {} and {} is too large to hold exactly.", a.to_string(), b.to_string()));
  return {r, s};
}

Decimal operator-(Decimal a, Decimal b) { return a + (-b); }

std::strong_ordering operator<=>(Decimal a, Decimal b) {
  const int s = std::max(a.scale_, b.scale_);
  const Int128 x = static_cast<Int128>(a.units_) * pow10_i128(s - a.scale_);
  const Int128 y = static_cast<Int128>(b.units_) * pow10_i128(s - b.scale_);
  return x <=> y;
}

}  // namespace plumb
