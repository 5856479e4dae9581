#include "report/dcc/units.hpp"

#include <array>

namespace plumb::report::dcc {
namespace {

// D-SI 2.1.0 writes the kilogram as the base unit "\kilogram" and other multiples of the gram with a prefix
// ("\milli\gram"); a product of units is written by juxtaposition, a power with "\tothe{n}".
constexpr std::array<UnitRow, 12> rows{{
    {Unit::kilogram, "\\kilogram", Dimension::mass, 3},
    {Unit::gram, "\\gram", Dimension::mass, 0},
    {Unit::milligram, "\\milli\\gram", Dimension::mass, -3},
    {Unit::microgram, "\\micro\\gram", Dimension::mass, -6},
    {Unit::millilitre, "\\milli\\litre", Dimension::volume, 3},
    {Unit::microlitre, "\\micro\\litre", Dimension::volume, 0},
    {Unit::microlitre_per_milligram, "\\micro\\litre\\milli\\gram\\tothe{-1}", Dimension::volume_per_mass, 0},
    {Unit::percent, "\\percent", Dimension::ratio, 0},
    {Unit::degree_celsius, "\\degreecelsius", Dimension::temperature, 0},
    {Unit::hectopascal, "\\hecto\\pascal", Dimension::pressure, 0},
    {Unit::kilogram_per_cubic_metre, "\\kilogram\\metre\\tothe{-3}", Dimension::density, 0},
    {Unit::one, "\\one", Dimension::ratio, 0},
}};

}  // namespace

std::span<const UnitRow> unit_table() {
  return rows;
}

std::string_view dsi_text(Unit u) {
  for (const auto& r : rows)
    if (r.unit == u) return r.dsi;
  return "\\one";  // unreachable: every enumerator has a row (units_test checks it)
}

std::optional<UnitRow> find_dsi_unit(std::string_view text) {
  for (const auto& r : rows)
    if (r.dsi == text) return r;
  // A prefixed kilogram is how some writers spell it; it means the same mass.
  if (text == "\\kilo\\gram") return rows[0];
  return std::nullopt;
}

}  // namespace plumb::report::dcc
