#include "app/runs/resolve.hpp"

#include <fmt/format.h>

#include <charconv>

#include "core/errors.hpp"
#include "store/repository.hpp"

namespace plumb::app {

std::int64_t resolve_run(store::Database& db, const std::string& selector) {
  if (selector == "LAST") {
    auto id = store::last_run_id(db.sql());
    if (!id) throw InputError("run LAST: no check has been recorded yet.");
    return *id;
  }
  std::int64_t id = 0;
  const auto [p, ec] = std::from_chars(selector.data(), selector.data() + selector.size(), id);
  if (ec != std::errc() || p != selector.data() + selector.size() || id <= 0)
    throw InputError(fmt::format("run \"{}\" is not a run number or LAST.", selector));
  if (!store::find_run(db.sql(), id)) throw InputError(fmt::format("run {} does not exist.", id));
  return id;
}

}  // namespace plumb::app
