#include "metrology/accuracy_classes.hpp"

#include <fmt/format.h>
#include <fmt/ranges.h>

#include <algorithm>
#include <array>
#include <string>
#include <vector>

#include "core/errors.hpp"

namespace plumb::r76 {

namespace {

// OIML R 76-1:2006 Table 6, from memory (cross-checked against the reference CSV by a test).
constexpr std::array<MpeBand, 12> kBands{{
    {AccuracyClass::I, 0, 50000, 1},
    {AccuracyClass::I, 50000, 200000, 2},
    {AccuracyClass::I, 200000, std::nullopt, 3},
    {AccuracyClass::II, 0, 5000, 1},
    {AccuracyClass::II, 5000, 20000, 2},
    {AccuracyClass::II, 20000, 100000, 3},
    {AccuracyClass::III, 0, 500, 1},
    {AccuracyClass::III, 500, 2000, 2},
    {AccuracyClass::III, 2000, 10000, 3},
    {AccuracyClass::IIII, 0, 50, 1},
    {AccuracyClass::IIII, 50, 200, 2},
    {AccuracyClass::IIII, 200, 1000, 3},
}};

// Exact comparison of a mass with n * e: both as integers at a common scale.
int compare_with_multiple(ExactMass load, long long n, ExactMass e) {
  const Decimal m = load.in_grams(), d = e.in_grams();
  const int s = std::max(m.scale(), d.scale());
  const Int128 lhs = static_cast<Int128>(m.units()) * pow10_i128(s - m.scale());
  const Int128 rhs = static_cast<Int128>(n) * static_cast<Int128>(d.units()) * pow10_i128(s - d.scale());
  return lhs < rhs ? -1 : (lhs > rhs ? 1 : 0);
}

}  // namespace

std::string_view to_string(AccuracyClass c) {
  switch (c) {
    case AccuracyClass::I: return "I";
    case AccuracyClass::II: return "II";
    case AccuracyClass::III: return "III";
    case AccuracyClass::IIII: return "IIII";
  }
  return "?";
}

AccuracyClass parse_accuracy_class(std::string_view text, std::string_view field) {
  std::string t;
  for (char ch : text)
    if (ch != ' ') t.push_back(static_cast<char>(std::toupper(static_cast<unsigned char>(ch))));
  if (t == "I" || t == "1") return AccuracyClass::I;
  if (t == "II" || t == "2") return AccuracyClass::II;
  if (t == "III" || t == "3") return AccuracyClass::III;
  if (t == "IIII" || t == "4") return AccuracyClass::IIII;
  throw InputError(fmt::format("{}: \"{}\" is not an OIML R 76 accuracy class (I, II, III, IIII).", field, text));
}

std::span<const MpeBand> bands() { return kBands; }

namespace {

// OIML R 76-1:2006 Table 3, from memory.
constexpr std::array<ClassificationRow, 6> kClassification{{
    {AccuracyClass::I, "0.001g", nullptr, 50000, 0},
    {AccuracyClass::II, "0.001g", "0.05g", 100, 100000},
    {AccuracyClass::II, "0.1g", nullptr, 5000, 100000},
    {AccuracyClass::III, "0.1g", "2g", 100, 10000},
    {AccuracyClass::III, "5g", nullptr, 500, 10000},
    {AccuracyClass::IIII, "5g", nullptr, 100, 1000},
}};

ExactMass table_mass(const char* text) {
  return ExactMass::parse(text, "R 76-1 Table 3");
}

/// 1, 2 or 5 times a power of ten: the significant digits of e, trailing zeros dropped, are "1", "2" or "5".
bool one_two_five(ExactMass e) {
  const Decimal d = e.in_grams();
  const Decimal digits = d.rescaled(d.significant_scale());
  std::int64_t u = digits.units();
  while (u != 0 && u % 10 == 0) u /= 10;
  return u == 1 || u == 2 || u == 5;
}

std::string e_range(const ClassificationRow& row) {
  return row.e_to ? fmt::format("from {} to {}", table_mass(row.e_from).to_string(), table_mass(row.e_to).to_string())
                  : fmt::format("of {} or more", table_mass(row.e_from).to_string());
}

std::string n_range(const ClassificationRow& row) {
  return row.n_max ? fmt::format("{} to {}", row.n_min, row.n_max) : fmt::format("at least {}", row.n_min);
}

}  // namespace

std::span<const ClassificationRow> classification_rows() {
  return kClassification;
}

std::optional<std::string> classification_fault(AccuracyClass cls, ExactMass e, ExactMass max) {
  constexpr const char* source = "OIML R 76-1:2006";
  if (e <= ExactMass{}) return fmt::format("e = {} is not positive.", e.to_string());
  if (!one_two_five(e))
    return fmt::format("e = {} is not 1, 2 or 5 times a power of ten ({} 3.4.1).", e.to_string(), source);
  std::vector<std::string> ranges;
  for (const auto& row : kClassification) {
    if (row.cls != cls) continue;
    ranges.push_back(e_range(row));
    if (e < table_mass(row.e_from) || (row.e_to && e > table_mass(row.e_to))) continue;
    // n = Max / e compared exactly: n_min * e <= Max (and Max <= n_max * e).
    if (compare_with_multiple(max, row.n_min, e) < 0 || (row.n_max && compare_with_multiple(max, row.n_max, e) > 0))
      return fmt::format("class {} with e = {} needs n = Max / e of {} ({} Table 3); Max = {} gives n = {}.",
                         to_string(cls), e.to_string(), n_range(row), source, max.to_string(),
                         max.approx().g() / e.approx().g());
    return std::nullopt;
  }
  return fmt::format("class {} allows e {} ({} Table 3), not e = {}.", to_string(cls), fmt::join(ranges, ", or "),
                     source, e.to_string());
}

std::string_view to_string(Verification v) {
  return v == Verification::initial ? "initial verification" : "in service";
}

ExactMass mpe(AccuracyClass cls, ExactMass e, ExactMass load, Verification v) {
  if (e.in_grams().units() <= 0)
    throw InputError(fmt::format("verification scale interval e: {} is not positive.", e.to_string()));
  if (load.in_grams().units() < 0)
    throw InputError(fmt::format("load: {} is negative.", load.to_string()));
  for (const auto& b : kBands) {
    if (b.cls != cls) continue;
    if (b.load_to_e && compare_with_multiple(load, *b.load_to_e, e) > 0) continue;
    // MPE = mpe_half_e * e / 2 (x2 in service), exact: units * factor at one more decimal.
    const Decimal d = e.in_grams();
    const std::int64_t factor = static_cast<std::int64_t>(b.mpe_half_e) * (v == Verification::in_service ? 2 : 1) * 5;
    if (factor % 10 == 0) return ExactMass::grams(Decimal(d.units() * (factor / 10), d.scale()));
    return ExactMass::grams(Decimal(d.units() * factor, d.scale() + 1));
  }
  throw InputError(fmt::format("load: {} is above the largest load OIML R 76 class {} covers with e = {}.",
                               load.to_string(), to_string(cls), e.to_string()));
}

}  // namespace plumb::r76
