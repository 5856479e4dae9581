#include "metrology/weight_density_limits.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>

namespace plumb::weights {

namespace {

constexpr double conventional_density = 8000.0;

/// One cell of Table 5 in kg/m3: {min, max}; max 0 for "lower limit only", min 0 for "no limit".
struct Cell {
  double min = 0.0, max = 0.0;
};

struct Row {
  const char* nominal;         ///< the row's nominal value ("100 g" stands for ">= 100 g")
  std::array<Cell, 9> cells;   ///< E1, E2, F1, F2, M1, M1-2, M2, M2-3, M3
};

// OIML R 111-1:2004 Table 5 (from memory, see the header), 10^3 kg/m3 in the standard, kg/m3 here.
constexpr std::array<Row, 12> kTable{{
    {"100 g",
     {Cell{7934, 8067}, Cell{7810, 8210}, Cell{7390, 8730}, Cell{6400, 10700}, Cell{4400, 0}, Cell{3000, 0},
      Cell{2300, 0}, Cell{1500, 0}, Cell{}}},
    {"50 g", {Cell{7920, 8080}, Cell{7740, 8280}, Cell{7270, 8890}, Cell{6000, 12000}, Cell{4000, 0}}},
    {"20 g", {Cell{7840, 8170}, Cell{7500, 8570}, Cell{6600, 10100}, Cell{4800, 24000}, Cell{2600, 0}}},
    {"10 g", {Cell{7740, 8280}, Cell{7270, 8890}, Cell{6000, 12000}, Cell{4000, 0}, Cell{2000, 0}}},
    {"5 g", {Cell{7620, 8420}, Cell{6900, 9600}, Cell{5300, 16000}, Cell{3000, 0}}},
    {"2 g", {Cell{7270, 8890}, Cell{6000, 12000}, Cell{4000, 0}, Cell{2000, 0}}},
    {"1 g", {Cell{6900, 9600}, Cell{5300, 16000}, Cell{3000, 0}}},
    {"500 mg", {Cell{6300, 10900}, Cell{4400, 0}, Cell{2200, 0}}},
    {"200 mg", {Cell{5300, 16000}, Cell{3000, 0}}},
    {"100 mg", {Cell{4400, 0}}},
    {"50 mg", {Cell{3400, 0}}},
    {"20 mg", {Cell{2300, 0}}},
}};

std::size_t column(WeightClass c) {
  const auto classes = all_classes();
  return static_cast<std::size_t>(std::find(classes.begin(), classes.end(), c) - classes.begin());
}

}  // namespace

std::optional<DensityLimits> density_limits(WeightClass c, ExactMass nominal) {
  for (const Row& row : kTable) {
    if (nominal < ExactMass::parse(row.nominal, "Table 5 nominal")) continue;
    const Cell& cell = row.cells[column(c)];
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
  const double below = conventional_density - limits->min_kg_m3;
  const double above = limits->max_kg_m3 ? *limits->max_kg_m3 - conventional_density : below;
  d.rho_kg_m3 = conventional_density;
  d.u_kg_m3 = std::max(below, above) / std::sqrt(3.0);
  for (const Row& row : kTable)
    if (!(nominal < ExactMass::parse(row.nominal, "Table 5 nominal"))) {
      const std::string range = limits->max_kg_m3
                                    ? fmt::format("{:.0f} to {:.0f} kg/m3", limits->min_kg_m3, *limits->max_kg_m3)
                                    : fmt::format("at least {:.0f} kg/m3", limits->min_kg_m3);
      d.basis = fmt::format("OIML R 111-1:2004 Table 5, class {}, {}{}: {}; 8000 kg/m3 with a rectangular u "
                            "covering the limits",
                            to_string(c), row.nominal == std::string_view("100 g") ? ">= " : "", row.nominal, range);
      break;
    }
  return d;
}

}  // namespace plumb::weights
