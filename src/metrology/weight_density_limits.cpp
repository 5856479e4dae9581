#include "metrology/weight_density_limits.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>

namespace plumb::weights {

namespace {

constexpr double density_of_conventional_mass = 8000.0;

/// One cell of Table 5 in kg/m3: {min, max}; max 0 for "lower limit only", min 0 for "no limit".
struct DensityCell {
  double min = 0.0, max = 0.0;
};

struct DensityRow {
  const char* nominal;               ///< the row's nominal value ("100 g" stands for ">= 100 g")
  std::array<DensityCell, 9> cells;  ///< E1, E2, F1, F2, M1, M1-2, M2, M2-3, M3
};

// OIML R 111-1:2004 Table 5 (from memory, see the header), 10^3 kg/m3 in the standard, kg/m3 here.
constexpr std::array<DensityRow, 12> kDensityTable{{
    {"100 g",
     {DensityCell{7934, 8067}, DensityCell{7810, 8210}, DensityCell{7390, 8730}, DensityCell{6400, 10700},
      DensityCell{4400, 0}, DensityCell{3000, 0}, DensityCell{2300, 0}, DensityCell{1500, 0}, DensityCell{}}},
    {"50 g",
     {DensityCell{7920, 8080}, DensityCell{7740, 8280}, DensityCell{7270, 8890}, DensityCell{6000, 12000},
      DensityCell{4000, 0}}},
    {"20 g",
     {DensityCell{7840, 8170}, DensityCell{7500, 8570}, DensityCell{6600, 10100}, DensityCell{4800, 24000},
      DensityCell{2600, 0}}},
    {"10 g",
     {DensityCell{7740, 8280}, DensityCell{7270, 8890}, DensityCell{6000, 12000}, DensityCell{4000, 0},
      DensityCell{2000, 0}}},
    {"5 g", {DensityCell{7620, 8420}, DensityCell{6900, 9600}, DensityCell{5300, 16000}, DensityCell{3000, 0}}},
    {"2 g", {DensityCell{7270, 8890}, DensityCell{6000, 12000}, DensityCell{4000, 0}, DensityCell{2000, 0}}},
    {"1 g", {DensityCell{6900, 9600}, DensityCell{5300, 16000}, DensityCell{3000, 0}}},
    {"500 mg", {DensityCell{6300, 10900}, DensityCell{4400, 0}, DensityCell{2200, 0}}},
    {"200 mg", {DensityCell{5300, 16000}, DensityCell{3000, 0}}},
    {"100 mg", {DensityCell{4400, 0}}},
    {"50 mg", {DensityCell{3400, 0}}},
    {"20 mg", {DensityCell{2300, 0}}},
}};

std::size_t density_column(WeightClass c) {
  const auto classes = all_classes();
  return static_cast<std::size_t>(std::find(classes.begin(), classes.end(), c) - classes.begin());
}

}  // namespace

std::optional<DensityLimits> density_limits(WeightClass c, ExactMass nominal) {
  for (const DensityRow& row : kDensityTable) {
    if (nominal < ExactMass::parse(row.nominal, "Table 5 nominal")) continue;
    const DensityCell& cell = row.cells[density_column(c)];
    if (cell.min <= 0.0) return std::nullopt;
    DensityLimits l{cell.min, std::nullopt};
    if (cell.max > 0.0) l.max_kg_m3 = cell.max;
    return l;
  }
  return std::nullopt;  // below 20 mg
}

std::optional<ClassDensity> density_from_class(WeightClass c, ExactMass nominal) {
  const auto limits = density_limits(c, nominal);
  if (!limits) return std::nullopt;
  ClassDensity d;
  d.limits = *limits;
  const double below = density_of_conventional_mass - limits->min_kg_m3;
  const double above = limits->max_kg_m3 ? *limits->max_kg_m3 - density_of_conventional_mass : below;
  d.rho_kg_m3 = density_of_conventional_mass;
  d.u_kg_m3 = std::max(below, above) / std::sqrt(3.0);
  for (const DensityRow& row : kDensityTable)
    if (!(nominal < ExactMass::parse(row.nominal, "Table 5 nominal"))) {
      const std::string range = limits->max_kg_m3
                                    ? fmt::format("{:.0f} to {:.0f} kg/m3", limits->min_kg_m3, *limits->max_kg_m3)
                                    : fmt::format("at least {:.0f} kg/m3", limits->min_kg_m3);
      d.basis = fmt::format(
          "OIML R 111-1:2004 Table 5, class {}, {}{}: {}; 8000 kg/m3 with a rectangular u "
          "covering the limits",
          to_string(c), row.nominal == std::string_view("100 g") ? ">= " : "", row.nominal, range);
      break;
    }
  return d;
}

}  // namespace plumb::weights
