#include "core/natural_order.hpp"

#include <cctype>

namespace plumb {
namespace {

bool is_digit(char c) {
  return std::isdigit(static_cast<unsigned char>(c)) != 0;
}
int lower(char c) {
  return std::tolower(static_cast<unsigned char>(c));
}

/// Compares the digit runs that start at a[i] and b[j] by value (leading zeros do not count) and moves past them.
int compare_numbers(std::string_view a, std::size_t& i, std::string_view b, std::size_t& j) {
  const auto run = [](std::string_view s, std::size_t& k) {
    while (k < s.size() && s[k] == '0') ++k;  // "007" is 7
    const std::size_t first = k;
    while (k < s.size() && is_digit(s[k])) ++k;
    return s.substr(first, k - first);
  };
  const std::string_view x = run(a, i), y = run(b, j);
  // Without leading zeros, a longer run is a larger number; runs of one length compare digit by digit.
  if (x.size() != y.size()) return x.size() < y.size() ? -1 : 1;
  const int c = x.compare(y);
  return c < 0 ? -1 : (c > 0 ? 1 : 0);
}

}  // namespace

int compare_natural(std::string_view a, std::string_view b) {
  std::size_t i = 0, j = 0;
  while (i < a.size() && j < b.size()) {
    if (is_digit(a[i]) && is_digit(b[j])) {
      if (const int c = compare_numbers(a, i, b, j); c != 0) return c;
      continue;
    }
    if (const int c = lower(a[i]) - lower(b[j]); c != 0) return c < 0 ? -1 : 1;
    ++i;
    ++j;
  }
  if (i < a.size() || j < b.size()) return i < a.size() ? 1 : -1;  // a prefix comes first
  const int c = a.compare(b);
  return c < 0 ? -1 : (c > 0 ? 1 : 0);
}

}  // namespace plumb
