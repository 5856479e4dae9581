#include "core/condition_units.hpp"

#include <fmt/format.h>

#include <cctype>
#include <utility>

#include "core/errors.hpp"

namespace plumb {
namespace {

/// "20.5 degC" -> ("20.5", "degC"): the leading number and what follows it, spaces between them dropped.
std::pair<std::string_view, std::string_view> number_and_unit(std::string_view text) {
  std::size_t end = 0;
  while (end < text.size() && (std::isdigit(static_cast<unsigned char>(text[end])) || text[end] == '.' ||
                               text[end] == '-' || text[end] == '+'))
    ++end;
  std::string_view unit = text.substr(end);
  while (!unit.empty() && unit.front() == ' ') unit.remove_prefix(1);
  return {text.substr(0, end), unit};
}

/// The number of `text`, refusing a missing number, a missing unit (with `example_unit` in the advice) and a
/// unit that is not one of `units` (each with the power of ten that turns it into the result's unit).
Decimal parse_with_unit(std::string_view text, std::string_view field,
                        std::initializer_list<std::pair<std::string_view, int>> units, std::string_view example_unit,
                        std::string_view quantity, std::string_view unit_list) {
  const auto [number, unit] = number_and_unit(text);
  if (number.empty())
    throw InputError(fmt::format("{} \"{}\" is not a {} (expected a number and its unit, e.g. {}).", field, text,
                                 quantity, example_unit));
  const Decimal value = Decimal::parse(number, field);
  if (unit.empty())
    throw InputError(
        fmt::format("{} \"{}\" has no unit; write it with its unit, e.g. {}{}.", field, text, number, example_unit));
  for (const auto& [name, shift] : units)
    if (unit == name) return value.shifted(shift);
  throw InputError(fmt::format("{} \"{}\" does not end in a unit of {} (use {}).", field, text, quantity, unit_list));
}

}  // namespace

Decimal parse_celsius(std::string_view text, std::string_view field) {
  return parse_with_unit(text, field,
                         {{"C", 0},
                          {"degC", 0},
                          {"\xC2\xB0"
                           "C",
                           0}},
                         "C", "temperature",
                         "C, degC or \xC2\xB0"
                         "C");
}

Decimal parse_hectopascals(std::string_view text, std::string_view field) {
  return parse_with_unit(text, field, {{"hPa", 0}, {"mbar", 0}, {"kPa", 1}}, "hPa", "pressure", "hPa, mbar or kPa");
}

Decimal parse_percent_rh(std::string_view text, std::string_view field) {
  return parse_with_unit(text, field, {{"%", 0}, {"%RH", 0}, {"% RH", 0}}, "%", "relative humidity", "% or %RH");
}

Decimal parse_kg_per_cubic_metre(std::string_view text, std::string_view field) {
  return parse_with_unit(text, field, {{"kg/m3", 0}, {"kg/m^3", 0}, {"g/cm3", 3}, {"g/cm^3", 3}}, "kg/m3", "density",
                         "kg/m3 or g/cm3");
}

}  // namespace plumb
