#include "checks/procedure.hpp"

#include <fmt/format.h>
#include <fmt/ranges.h>

#include <string>
#include <vector>

#include "core/errors.hpp"

namespace plumb::checks {
namespace {

constexpr std::array<std::string_view, 1> repeatability_options{"weight"};
constexpr std::array<std::string_view, 8> calibration_options{
    "temperature", "pressure", "humidity", "air-formula", "model", "temperature-u", "pressure-u", "humidity-u"};
constexpr std::array<std::string_view, 7> gravimetric_options{"balance",     "water-temp",    "pressure",
                                                              "humidity",    "evaporation",   "water-temp-u",
                                                              "air-density-u"};
constexpr std::array<std::string_view, 8> repeatability_results{"n",           "mean_g",  "reference_g", "bias_g",
                                                                 "sd_g",        "min_weight_g", "criteria", "reasons"};
constexpr std::array<std::string_view, 7> calibration_results{"as_found",    "as_left",  "final_stage", "final_state",
                                                              "environment", "settings", "weights_used"};
constexpr std::array<std::string_view, 6> gravimetric_results{"volumes", "z",      "environment",
                                                              "balance", "pipette", "reasons"};
constexpr std::array<std::string_view, 14> every_option{
    "weight",     "temperature", "pressure",     "humidity",      "air-formula",   "model",      "balance",
    "water-temp", "evaporation", "water-temp-u", "air-density-u", "temperature-u", "pressure-u", "humidity-u"};

ProcedureSpec make_spec(Procedure p) {
  switch (p) {
    case Procedure::repeatability:
      return {p,
              "repeatability",
              InstrumentKind::balance,
              "weekly check of a balance: repeatability and bias with one reference weight (USP <41> or the "
              "lab's limits)",
              "BC",
              "balance_check",
              "Balance check certificate",
              true,
              repeatability_options,
              repeatability_results};
    case Procedure::calibration:
      return {p,
              "calibration",
              InstrumentKind::balance,
              "periodic calibration of a balance: eccentricity, repeatability and error of indication, as found "
              "and as left (EURAMET cg-18, OIML R 76)",
              "CC",
              "balance_calibration",
              "Balance calibration certificate",
              true,
              calibration_options,
              calibration_results};
    case Procedure::gravimetric:
      return {p,
              "gravimetric",
              InstrumentKind::pipette,
              "gravimetric check of a piston pipette: systematic and random error per volume and channel "
              "(ISO 8655-6)",
              "PC",
              "pipette_check",
              "Pipette check certificate",
              true,
              gravimetric_options,
              gravimetric_results};
  }
  throw std::logic_error("unknown procedure");  // not reached: the switch names every Procedure
}

const std::array<ProcedureSpec, all_procedures.size()>& table() {
  static const auto t = [] {
    std::array<ProcedureSpec, all_procedures.size()> out{};
    for (std::size_t i = 0; i < all_procedures.size(); ++i) out[i] = make_spec(all_procedures[i]);
    return out;
  }();
  return t;
}

}  // namespace

std::string_view to_string(InstrumentKind k) {
  switch (k) {
    case InstrumentKind::balance: return "balance";
    case InstrumentKind::pipette: return "pipette";
  }
  return "instrument";
}

const ProcedureSpec& spec(Procedure p) {
  for (const auto& s : table())
    if (s.procedure == p) return s;
  throw std::logic_error("procedure missing from the registry");
}

std::optional<Procedure> find_procedure(std::string_view key) {
  for (const auto& s : table())
    if (s.key == key) return s.procedure;
  return std::nullopt;
}

Procedure parse_procedure(std::string_view key, std::string_view field) {
  if (auto p = find_procedure(key)) return *p;
  std::vector<std::string_view> keys;
  for (const auto& s : table()) keys.push_back(s.key);
  throw InputError(fmt::format("{} \"{}\" is not known (known: {}).", field, key, fmt::join(keys, ", ")));
}

std::optional<Procedure> procedure_of_certificate_kind(std::string_view kind) {
  for (const auto& s : table())
    if (s.certificate_kind == kind) return s.procedure;
  return std::nullopt;
}

std::span<const std::string_view> procedure_options() { return every_option; }

}  // namespace plumb::checks
