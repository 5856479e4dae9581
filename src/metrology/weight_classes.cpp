#include "metrology/weight_classes.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cctype>

#include "core/errors.hpp"

namespace plumb::weights {

namespace {

constexpr std::array<WeightClass, 9> kClasses{WeightClass::E1, WeightClass::E2, WeightClass::F1,
                                              WeightClass::F2, WeightClass::M1, WeightClass::M1_2,
                                              WeightClass::M2, WeightClass::M2_3, WeightClass::M3};

struct Row {
  const char* nominal;                 ///< as in R 111 Table 1
  std::array<const char*, 9> mpe_mg;   ///< by class in kClasses order; nullptr where R 111 gives none
};

// OIML R 111-1:2004 Table 1, MPE in mg. E1..M1 from memory, cross-checked with the reference CSV by a test;
// M1-2, M2, M2-3, M3 from memory only (see the header).
constexpr std::array<Row, 24> kTable{{
    {"50 kg", {"25", "80", "250", "800", "2500", "5000", "8000", "16000", "25000"}},
    {"20 kg", {"10", "30", "100", "300", "1000", nullptr, "3000", nullptr, "10000"}},
    {"10 kg", {"5.0", "16", "50", "160", "500", nullptr, "1600", nullptr, "5000"}},
    {"5 kg", {"2.5", "8.0", "25", "80", "250", nullptr, "800", nullptr, "2500"}},
    {"2 kg", {"1.0", "3.0", "10", "30", "100", nullptr, "300", nullptr, "1000"}},
    {"1 kg", {"0.5", "1.6", "5.0", "16", "50", nullptr, "160", nullptr, "500"}},
    {"500 g", {"0.25", "0.8", "2.5", "8.0", "25", nullptr, "80", nullptr, "250"}},
    {"200 g", {"0.10", "0.3", "1.0", "3.0", "10", nullptr, "30", nullptr, "100"}},
    {"100 g", {"0.05", "0.16", "0.5", "1.6", "5.0", nullptr, "16", nullptr, "50"}},
    {"50 g", {"0.03", "0.10", "0.3", "1.0", "3.0", nullptr, "10", nullptr, "30"}},
    {"20 g", {"0.025", "0.08", "0.25", "0.8", "2.5", nullptr, "8.0", nullptr, "25"}},
    {"10 g", {"0.020", "0.06", "0.20", "0.6", "2.0", nullptr, "6.0", nullptr, "20"}},
    {"5 g", {"0.016", "0.05", "0.16", "0.5", "1.6", nullptr, "5.0", nullptr, "16"}},
    {"2 g", {"0.012", "0.04", "0.12", "0.4", "1.2", nullptr, "4.0", nullptr, "12"}},
    {"1 g", {"0.010", "0.03", "0.10", "0.3", "1.0", nullptr, "3.0", nullptr, "10"}},
    {"500 mg", {"0.008", "0.025", "0.08", "0.25", "0.8", nullptr, "2.5", nullptr, nullptr}},
    {"200 mg", {"0.006", "0.020", "0.06", "0.20", "0.6", nullptr, "2.0", nullptr, nullptr}},
    {"100 mg", {"0.005", "0.016", "0.05", "0.16", "0.5", nullptr, "1.6", nullptr, nullptr}},
    {"50 mg", {"0.004", "0.012", "0.04", "0.12", "0.4", nullptr, nullptr, nullptr, nullptr}},
    {"20 mg", {"0.003", "0.010", "0.03", "0.10", "0.3", nullptr, nullptr, nullptr, nullptr}},
    {"10 mg", {"0.003", "0.008", "0.025", "0.08", "0.25", nullptr, nullptr, nullptr, nullptr}},
    {"5 mg", {"0.003", "0.006", "0.020", "0.06", "0.20", nullptr, nullptr, nullptr, nullptr}},
    {"2 mg", {"0.003", "0.006", "0.020", "0.06", "0.20", nullptr, nullptr, nullptr, nullptr}},
    {"1 mg", {"0.003", "0.006", "0.020", "0.06", "0.20", nullptr, nullptr, nullptr, nullptr}},
}};

std::size_t index_of(WeightClass c) {
  return static_cast<std::size_t>(std::find(kClasses.begin(), kClasses.end(), c) - kClasses.begin());
}

}  // namespace

std::string_view to_string(WeightClass c) {
  switch (c) {
    case WeightClass::E1: return "E1";
    case WeightClass::E2: return "E2";
    case WeightClass::F1: return "F1";
    case WeightClass::F2: return "F2";
    case WeightClass::M1: return "M1";
    case WeightClass::M1_2: return "M1-2";
    case WeightClass::M2: return "M2";
    case WeightClass::M2_3: return "M2-3";
    case WeightClass::M3: return "M3";
  }
  return "?";
}

WeightClass parse_weight_class(std::string_view text, std::string_view field) {
  std::string up;
  for (char ch : text)
    if (!std::isspace(static_cast<unsigned char>(ch))) up.push_back(static_cast<char>(std::toupper(static_cast<unsigned char>(ch))));
  for (WeightClass c : kClasses)
    if (up == to_string(c)) return c;
  throw InputError(fmt::format("{}: \"{}\" is not an OIML R 111 class (E1, E2, F1, F2, M1, M1-2, M2, M2-3, M3).",
                               field, text));
}

std::span<const WeightClass> all_classes() { return kClasses; }

bool cross_checked(WeightClass c) { return index_of(c) <= index_of(WeightClass::M1); }

std::vector<ExactMass> table_nominals() {
  std::vector<ExactMass> out;
  out.reserve(std::size(kTable));
  for (const auto& row : kTable) out.push_back(ExactMass::parse(row.nominal, "nominal"));
  return out;
}

std::optional<ExactMass> mpe(WeightClass c, ExactMass nominal) {
  for (const auto& row : kTable) {
    if (ExactMass::parse(row.nominal, "nominal") != nominal) continue;
    const char* v = row.mpe_mg[index_of(c)];
    if (v == nullptr) return std::nullopt;
    return ExactMass::from(Decimal::parse(v), MassUnit::mg);
  }
  return std::nullopt;
}

ExactMass mpe_or_throw(WeightClass c, ExactMass nominal, std::string_view id) {
  if (auto m = mpe(c, nominal)) return *m;
  throw InputError(fmt::format("weight {}: OIML R 111 gives no MPE for class {} at nominal value {}.", id,
                               to_string(c), nominal.to_string()));
}

}  // namespace plumb::weights
