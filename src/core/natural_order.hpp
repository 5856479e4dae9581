#pragma once
// The order in which plumb lists ids: natural order, so that W2 comes before W10 and BAL-9 before BAL-10.
// Runs of digits compare by their value, everything else character by character without regard to case; ids
// that still tie ("w1" and "W1", "W01" and "W1") fall back to plain byte order, so the order is total and the
// same in every list (the database sorts with it too: store registers it as the SQLite collation "natural_id").
#include <string_view>

namespace plumb {

/// Negative when `a` comes before `b`, zero when they are the same text, positive after.
int compare_natural(std::string_view a, std::string_view b);

/// For std::sort and ordered containers.
struct NaturalLess {
  bool operator()(std::string_view a, std::string_view b) const { return compare_natural(a, b) < 0; }
};

}  // namespace plumb
