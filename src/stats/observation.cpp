#include "stats/observation.hpp"

#include <fmt/format.h>

#include <cmath>

#include "core/errors.hpp"

namespace plumb::stats {

void require_well_formed(std::span<const Observation> history, std::string_view what) {
  for (std::size_t i = 0; i < history.size(); ++i) {
    const Observation& o = history[i];
    if (!std::isfinite(o.value))
      throw InputError(fmt::format("{}: result {} (dated {}) is not a finite number.", what, i + 1, plumb::to_string(o.date)));
    if (!std::isfinite(o.expanded_uncertainty) || o.expanded_uncertainty < 0)
      throw InputError(fmt::format("{}: expanded uncertainty of result {} (dated {}) is {}; it must be a finite "
                                   "number >= 0.",
                                   what, i + 1, plumb::to_string(o.date), o.expanded_uncertainty));
    if (i > 0 && o.date < history[i - 1].date)
      throw InputError(fmt::format("{}: result {} is dated {}, before the result ahead of it ({}); the history must "
                                   "be in date order.",
                                   what, i + 1, plumb::to_string(o.date), plumb::to_string(history[i - 1].date)));
  }
}

}  // namespace plumb::stats
