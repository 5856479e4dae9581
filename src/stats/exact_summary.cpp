#include "stats/exact_summary.hpp"

#include <algorithm>
#include <cmath>

#include "core/errors.hpp"

namespace plumb::stats {
namespace {

bool mul_ok(Int128 a, Int128 b, Int128& out) { return !__builtin_mul_overflow(a, b, &out); }
bool add_ok(Int128 a, Int128 b, Int128& out) { return !__builtin_add_overflow(a, b, &out); }

}  // namespace

ExactSummary summarize_exact(std::span<const Decimal> values) {
  ExactSummary s;
  s.n = static_cast<long long>(values.size());
  if (values.empty()) return s;
  for (const Decimal& v : values) s.scale = std::max(s.scale, v.scale());
  Int128 sum = 0, sum_sq = 0;
  double lo = values.front().to_double(), hi = lo;
  for (const Decimal& v : values) {
    const Int128 u = static_cast<Int128>(v.units()) * pow10_i128(s.scale - v.scale());
    Int128 sq = 0;
    if (!mul_ok(u, u, sq) || !add_ok(sum, u, sum) || !add_ok(sum_sq, sq, sum_sq))
      throw InputError("readings are too large or too many to sum exactly.");
    lo = std::min(lo, v.to_double());
    hi = std::max(hi, v.to_double());
  }
  Int128 n_sum_sq = 0, sum2 = 0;
  if (!mul_ok(sum_sq, s.n, n_sum_sq) || !mul_ok(sum, sum, sum2))
    throw InputError("readings are too large or too many to sum exactly.");
  s.sum = sum;
  s.centred_ss = n_sum_sq - sum2;
  s.min = lo;
  s.max = hi;
  return s;
}

double ExactSummary::mean() const {
  if (n == 0) return 0.0;
  return static_cast<double>(to_long_double(sum) / (static_cast<long double>(n) * to_long_double(pow10_i128(scale))));
}

double ExactSummary::variance() const {
  if (n < 2) return 0.0;
  const long double denom =
      static_cast<long double>(n) * static_cast<long double>(n - 1) * to_long_double(pow10_i128(2 * scale));
  return static_cast<double>(to_long_double(centred_ss) / denom);
}

double ExactSummary::sd() const {
  if (n < 2) return 0.0;
  const long double denom =
      static_cast<long double>(n) * static_cast<long double>(n - 1) * to_long_double(pow10_i128(2 * scale));
  return static_cast<double>(std::sqrt(to_long_double(centred_ss) / denom));
}

double ExactSummary::mean_minus(Decimal reference) const {
  if (n == 0) return 0.0;
  // (sum - n * ref) / (n * 10^s), all at the common scale s.
  const int s = std::max(scale, reference.scale());
  Int128 sum_s = sum * pow10_i128(s - scale);
  Int128 ref_s = static_cast<Int128>(reference.units()) * pow10_i128(s - reference.scale());
  Int128 diff = sum_s - ref_s * n;
  return static_cast<double>(to_long_double(diff) / (static_cast<long double>(n) * to_long_double(pow10_i128(s))));
}

}  // namespace plumb::stats
