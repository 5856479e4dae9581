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

ExactMass stored_grams(const SQLite::Column& c) { return ExactMass::grams(Decimal::parse(c.getString(), c.getName())); }

std::optional<ExactMass> stored_grams_or_none(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return stored_grams(c);
}

Value grams_value(const std::optional<ExactMass>& m) { return m ? Value(m->in_grams().to_string()) : Value(); }

Date stored_date(const SQLite::Column& c) { return parse_date(c.getString(), c.getName()); }

}  // namespace plumb::store
