#include "store/columns.hpp"

#include <fmt/format.h>

#include "core/errors.hpp"

namespace plumb::store {

checks::Procedure stored_procedure(const SQLite::Column& c) {
  const std::string key = c.getString();
  if (auto p = checks::find_procedure(key)) return *p;
  throw StorageError(fmt::format("column {} holds \"{}\", which is not a procedure this version of plumb knows.",
                                 c.getName(), key));
}

}  // namespace plumb::store
