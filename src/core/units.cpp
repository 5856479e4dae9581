#include "core/units.hpp"

#include <fmt/format.h>

#include <cctype>
#include <cmath>
#include <utility>

#include "core/errors.hpp"

namespace plumb {

MassUnit parse_mass_unit(std::string_view text, std::string_view field) {
  if (text == "ug" || text == "\xC2\xB5g" || text == "mcg") return MassUnit::ug;
  if (text == "mg") return MassUnit::mg;
  if (text == "g") return MassUnit::g;
  if (text == "kg") return MassUnit::kg;
  throw InputError(fmt::format("{} \"{}\" is not a unit of mass (use ug, mg, g or kg).", field, text));
}

VolumeUnit parse_volume_unit(std::string_view text, std::string_view field) {
  if (text == "ul" || text == "uL" || text == "\xC2\xB5L" || text == "\xC2\xB5l") return VolumeUnit::ul;
  if (text == "ml" || text == "mL") return VolumeUnit::ml;
  throw InputError(fmt::format("{} \"{}\" is not a unit of volume (use uL or mL).", field, text));
}

std::string_view to_string(MassUnit u) {
  switch (u) {
    case MassUnit::ug: return "ug";
    case MassUnit::mg: return "mg";
    case MassUnit::g: return "g";
    case MassUnit::kg: return "kg";
  }
  return "g";
}

std::string_view to_string(VolumeUnit u) { return u == VolumeUnit::ul ? "uL" : "mL"; }

int exponent_to_gram(MassUnit u) {
  switch (u) {
    case MassUnit::ug: return -6;
    case MassUnit::mg: return -3;
    case MassUnit::g: return 0;
    case MassUnit::kg: return 3;
  }
  return 0;
}

int exponent_to_microlitre(VolumeUnit u) { return u == VolumeUnit::ul ? 0 : 3; }

namespace {

/// "100 uL" -> ("100", "uL"): the leading number and the unit after it, spaces between them dropped.
std::pair<std::string_view, std::string_view> split_number(std::string_view text) {
  std::size_t end = 0;
  while (end < text.size() && (std::isdigit(static_cast<unsigned char>(text[end])) || text[end] == '.' ||
                               text[end] == '-' || text[end] == '+'))
    ++end;
  std::string_view unit = text.substr(end);
  while (!unit.empty() && unit.front() == ' ') unit.remove_prefix(1);
  return {text.substr(0, end), unit};
}

}  // namespace

ExactMass ExactMass::parse(std::string_view text, std::string_view field, std::optional<MassUnit> default_unit) {
  const auto [number, unit] = split_number(text);
  if (number.empty())
    throw InputError(fmt::format("{} \"{}\" is not a mass (expected a number and a unit, e.g. 100g).", field, text));
  const Decimal value = Decimal::parse(number, field);
  if (unit.empty() && !default_unit)
    throw InputError(
        fmt::format("{} \"{}\" has no unit; write it with its unit, e.g. {}mg or {}g.", field, text, number, number));
  MassUnit u = default_unit.value_or(MassUnit::g);
  if (!unit.empty()) {
    try {
      u = parse_mass_unit(unit, field);
    } catch (const InputError&) {
      throw InputError(fmt::format("{} \"{}\" does not end in a unit of mass (use ug, mg, g or kg).", field, text));
    }
  }
  return from(value, u);
}

ExactVolume ExactVolume::parse(std::string_view text, std::string_view field, std::optional<VolumeUnit> default_unit) {
  const auto [number, unit] = split_number(text);
  if (number.empty())
    throw InputError(
        fmt::format("{} \"{}\" is not a volume (expected a number and uL or mL, e.g. 100uL).", field, text));
  const Decimal value = Decimal::parse(number, field);
  if (unit.empty() && !default_unit)
    throw InputError(
        fmt::format("{} \"{}\" has no unit; write it with its unit, e.g. {}uL or {}mL.", field, text, number, number));
  VolumeUnit u = default_unit.value_or(VolumeUnit::ul);
  if (!unit.empty()) {
    try {
      u = parse_volume_unit(unit, field);
    } catch (const InputError&) {
      throw InputError(fmt::format("{} \"{}\" does not end in a unit of volume (use uL or mL).", field, text));
    }
  }
  return from(value, u);
}

std::vector<Decimal> in_grams(std::span<const ExactMass> masses) {
  std::vector<Decimal> out;
  out.reserve(masses.size());
  for (const ExactMass& m : masses) out.push_back(m.in_grams());
  return out;
}

std::string ExactMass::to_string() const {
  const auto tidy = [](Decimal d) { return d.rescaled(d.significant_scale()).to_string(); };
  const double a = std::abs(g_.to_double());
  if (a >= 1.0 || g_.units() == 0) return tidy(g_) + " g";
  if (a >= 1e-5) return tidy(g_.shifted(3)) + " mg";
  return tidy(g_.shifted(6)) + " ug";
}

std::string format_mass(Mass m, int significant) {
  const double a = std::abs(m.g());
  if (a == 0.0) return "0 g";
  if (a >= 1.0) return fmt::format("{:.{}g} g", m.g(), significant);
  if (a >= 1e-5) return fmt::format("{:.{}g} mg", m.mg(), significant);
  return fmt::format("{:.{}g} ug", m.ug(), significant);
}

}  // namespace plumb
