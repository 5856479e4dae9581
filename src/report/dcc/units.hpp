#pragma once
// The one table of D-SI unit texts plumb writes and reads (D-SI 2.1.0, which spells SI units as in the
// BIPM SI brochure, 9th edition: "\milli\gram", "\micro\litre", "\percent"). The DCC schema takes any
// string as a unit, so a misspelt unit would validate: every unit in a DCC comes from this table.
#include <optional>
#include <span>
#include <string_view>

namespace plumb::report::dcc {

enum class Unit {
  kilogram,
  gram,
  milligram,
  microgram,
  millilitre,
  microlitre,
  microlitre_per_milligram,
  percent,
  degree_celsius,
  hectopascal,
  kilogram_per_cubic_metre,
  one,  ///< a count or a ratio
};

enum class Dimension { mass, volume, volume_per_mass, ratio, temperature, pressure, density };

struct UnitRow {
  Unit unit;
  std::string_view dsi;  ///< the D-SI text written into si:unit
  Dimension dimension;
  int exponent_to_base;  ///< power of ten to the base unit of its dimension: gram, microlitre (mg -> -3)
};

/// Every unit plumb writes, one row each.
std::span<const UnitRow> unit_table();
/// The D-SI text of `u` ("\milli\gram").
std::string_view dsi_text(Unit u);
/// The unit a D-SI text denotes (also "\kilo\gram" for the kilogram), or nullopt for a text plumb does not read.
std::optional<UnitRow> find_dsi_unit(std::string_view text);

}  // namespace plumb::report::dcc
